// POST: try a published preset on one of the caller's growth surfaces before buying (202; read it
// at /api/market/trials/[trialId]). 429 with words past the per-buyer limit.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { startTrial } from '@/lib/market/fitting';
import type { PresetTransferResponse } from '@/lib/market/types';
import { presetTransferSchema } from '@/lib/market/validation';

export function POST(request: Request, { params }: { params: Promise<{ id: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) => {
    const listingId = await pathId(params, 'id', notFound('listing'));
    const { surfaceId } = await readBody(request, presetTransferSchema);
    return jsonData<PresetTransferResponse>({ transfer: await startTrial(actor, listingId, surfaceId) }, 202);
  });
}
