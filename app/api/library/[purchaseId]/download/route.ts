// POST: a presigned URL (5 minutes) of the purchase's package zip; the download is logged.
// 403 refunded after (or during) a refund; 409 package-pending while the zip is being made.
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { requestDownload } from '@/lib/market/library';
import type { DownloadResponse } from '@/lib/market/types';

export function POST(_request: Request, { params }: { params: Promise<{ purchaseId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) =>
    jsonData<DownloadResponse>(await requestDownload(actor, await pathId(params, 'purchaseId', notFound('purchase')))),
  );
}
