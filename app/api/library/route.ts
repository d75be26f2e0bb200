// GET: the signed-in person's purchases, newest first, with what can be downloaded.
import { marketData, marketHandler } from '@/lib/market/http';
import { listLibrary } from '@/lib/market/library';
import type { LibraryItem } from '@/lib/market/types';

export type LibraryResponse = { purchases: LibraryItem[] };

export function GET() {
  return marketHandler(['buyer', 'groomer'], async (actor) => marketData<LibraryResponse>({ purchases: await listLibrary(actor) }));
}
