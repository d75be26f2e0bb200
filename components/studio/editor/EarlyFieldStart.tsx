// The groom page's inline script that starts the field worker and the opening of the groom's
// surface while the HTML is still being parsed (lib/studio/client/field-start.ts says why). A
// server component: the script runs when the page is loaded; after a navigation inside the app it
// does not run (React never runs scripts it adds), and the editor starts its worker itself.
import type { BoundaryMode } from '@/lib/field';
import { earlyFieldScript } from '@/lib/studio/client/field-start';
import type { SurfaceSource } from '@/lib/studio/client/protocol';

export function EarlyFieldStart({ source, boundary }: { source: SurfaceSource; boundary: BoundaryMode }) {
  return <script dangerouslySetInnerHTML={{ __html: earlyFieldScript(source, boundary) }} />;
}
