// POST [?version=n]: a presigned URL (5 minutes) of the purchase's package zip — the newest version
// the owner may have, or version n (the one bought or a later one); the download is logged.
// 403 refunded after (or during) a refund; 409 package-pending while the zip is being made.
import { z } from 'zod';
import { handler, jsonData, parseInput, pathId, queryOf } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { requestDownload } from '@/lib/market/library';
import type { DownloadResponse } from '@/lib/market/types';

const querySchema = z.object({
  version: z.coerce.number({ error: 'version must be a whole number.' }).int('version must be a whole number.').min(1, 'Versions start at 1.').max(100_000).optional(),
});

export function POST(request: Request, { params }: { params: Promise<{ purchaseId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const purchaseId = await pathId(params, 'purchaseId', notFound('purchase'));
    const { version } = parseInput(querySchema, queryOf(request));
    return jsonData<DownloadResponse>(await requestDownload(actor, purchaseId, version));
  });
}
