// POST: a presigned URL (5 minutes) of the purchase's package zip; the download is logged.
// 403 refunded after (or during) a refund; 409 package-pending while the zip is being made.
import { marketData, marketHandler, pathId } from '@/lib/market/http';
import { requestDownload, type DownloadLink } from '@/lib/market/library';

export type DownloadResponse = DownloadLink;

export function POST(_request: Request, { params }: { params: Promise<{ purchaseId: string }> }) {
  return marketHandler(['buyer', 'groomer'], async (actor) =>
    marketData<DownloadResponse>(await requestDownload(actor, await pathId(params, 'purchaseId', 'purchase'))),
  );
}
