// GET: the signed-in person's purchases, newest first, with what can be downloaded.
import { handler, jsonData } from '@/lib/http/server';
import { listLibrary } from '@/lib/market/library';
import type { LibraryResponse } from '@/lib/market/types';

export function GET() {
  return handler(['buyer', 'groomer'], async (actor) => jsonData<LibraryResponse>({ purchases: await listLibrary(actor) }));
}
