// The editor's worker opening a prepared form: from the studio's server it takes the stored ring
// ordering and the check's mark (no ordering worked out, no check run again) and gets the field of
// the artist's file; the same bytes handed over by the page are checked again; a prepared form
// written before the groundwork (version 1) opens as before.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { readFileSync } from 'node:fs';
import { readSurface, ringOrderings, writePreparedSurface } from '@/lib/field';
import { DEMO_GROOMS } from '@/lib/groom/demo/grooms';
import { surfaceToObj } from '@/lib/groom/demo/obj';
import { parseGroomSpec } from '@/lib/groom/spec/spec';
import { solveGroomField } from '@/lib/groom';
import { FieldEngine } from '@/lib/studio/client/field-engine';
import type { SurfaceSource } from '@/lib/studio/client/protocol';

const demo = DEMO_GROOMS[0];
const obj = new TextEncoder().encode(surfaceToObj(demo.surface(), 'Bramble'));
const read = readSurface(obj, 'bramble.obj');
// As the check job writes it (lib/studio/surface-check.ts).
const prepared = writePreparedSurface(read, { checked: true, ringOrderings: ringOrderings(read.mesh) });

/** The server's answer for the prepared form, as `fetch` gives it to the worker. */
function serve(bytes: Uint8Array) {
  vi.stubGlobal('fetch', async () => new Response(bytes.slice(), { status: 200, headers: { 'content-length': String(bytes.length) } }));
}
const fromServer: SurfaceSource = { kind: 'url', url: '/api/studio/surfaces/s/prepared', fileName: 's.wwsurf' };

async function opened(source: SurfaceSource) {
  const engine = new FieldEngine();
  await engine.open(source, 'free');
  return engine.prepared!;
}

afterEach(() => vi.unstubAllGlobals());

describe('the worker opening a prepared form', () => {
  it('from the server: takes its ordering and its check mark, and solves the field of the OBJ to the last bit', async () => {
    serve(prepared);
    const surface = await opened(fromServer);
    expect(surface.field.reused).toEqual({ ordering: true, orderingRefused: null, check: true });
    const fromFile = await opened({ kind: 'bytes', bytes: obj.slice().buffer, fileName: 'bramble.obj' });
    expect(fromFile.field.reused).toEqual({ ordering: false, orderingRefused: null, check: false });
    const spec = parseGroomSpec(demo.spec);
    const a = solveGroomField(spec, fromFile).field.faceDirection;
    const b = solveGroomField(spec, surface).field.faceDirection;
    expect(Buffer.from(b.buffer).equals(Buffer.from(a.buffer))).toBe(true);
  });

  it('handed over by the page: the ordering is used (it is checked anyway), the check runs again', async () => {
    const surface = await opened({ kind: 'bytes', bytes: prepared.slice().buffer, fileName: 's.wwsurf' });
    expect(surface.field.reused).toEqual({ ordering: true, orderingRefused: null, check: false });
  });

  it('written before the groundwork (format version 1): opens, working the ordering out and checking', async () => {
    serve(new Uint8Array(readFileSync(new URL('../../fixtures/surfaces/ngons-and-groups.v1.wwsurf', import.meta.url))));
    const surface = await opened(fromServer);
    expect(surface.field.reused).toEqual({ ordering: false, orderingRefused: null, check: false });
  });
});
