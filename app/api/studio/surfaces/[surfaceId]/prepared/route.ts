// A growth surface of the groomer's in its prepared form (read and welded once, by its check): the
// editor opens it instead of the file. The surface never changes, so the browser keeps it.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/studio/errors';
import { preparedSurfaceBytes } from '@/lib/studio/surfaces';

type Context = { params: Promise<{ surfaceId: string }> };

export function GET(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const bytes = await preparedSurfaceBytes(groomer, await pathId(context.params, 'surfaceId', notFound('surface')));
    return new Response(new Blob([bytes as Uint8Array<ArrayBuffer>]), {
      headers: { 'content-type': 'application/octet-stream', 'cache-control': 'private, max-age=31536000, immutable', 'content-length': String(bytes.byteLength) },
    });
  });
}
