// A listing's public guide preview is a reduced asset of its own (lib/groom's previewGuides: a
// tenth of the guides at most, a few points each, no widths or binding), no longer the package's
// guides.glb. `preview_key` names it once the asset job has written it; until then the listing
// shows no 3D preview, so the old full-guide file (preview/guides.glb) is never handed out again.
// Listings made before this are rebuilt by the asset job: the market's job workers queue every
// ready listing without a preview_key when they start (lib/market/workers.ts), and the rebuild
// deletes the old file.
import type { Knex } from 'knex';

export async function up(knex: Knex) {
  await knex.schema.alterTable('listings', (table) => {
    table.text('preview_key');
  });
}

export async function down(knex: Knex) {
  await knex.schema.alterTable('listings', (table) => {
    table.dropColumn('preview_key');
  });
}
