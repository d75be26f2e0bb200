// GET: the admins' queue of listing updates waiting for review, oldest first.
import { handler, jsonData } from '@/lib/http/server';
import { listVersionsForAdmin } from '@/lib/market/listings';
import type { AdminListingVersionsResponse } from '@/lib/market/types';

export function GET() {
  return handler(['admin'], async () => jsonData<AdminListingVersionsResponse>({ versions: await listVersionsForAdmin() }));
}
