// GET: the market's licences in full, for the listing form and the licence pages.
import { handler, jsonData } from '@/lib/http/server';
import { listLicences } from '@/lib/market/licences';
import type { LicencesResponse } from '@/lib/market/types';

export function GET() {
  return handler('none', async () => jsonData<LicencesResponse>({ licences: await listLicences() }));
}
