// GET: the market's licences in full, for the listing form and the licence pages.
import { listLicences, type Licence } from '@/lib/market/licences';
import { marketData, plainMarketHandler } from '@/lib/market/http';

export type LicencesResponse = { licences: Licence[] };

export function GET() {
  return plainMarketHandler(async () => marketData<LicencesResponse>({ licences: await listLicences() }));
}
