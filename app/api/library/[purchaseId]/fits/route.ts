// POST: start fitting a bought preset to one of the buyer's growth surfaces (202; read it at
// /api/library/fits/[fitId]). 403 refunded once the purchase is refunded or being refunded.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { startFit } from '@/lib/market/fitting';
import type { PresetTransferResponse } from '@/lib/market/types';
import { presetTransferSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ purchaseId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const purchaseId = await pathId(params, 'purchaseId', notFound('purchase'));
    const { surfaceId } = await readBody(request, presetTransferSchema);
    return jsonData<PresetTransferResponse>({ transfer: await startFit(actor, purchaseId, surfaceId) }, 202);
  });
}
