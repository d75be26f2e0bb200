// GET: a trial as it stands — its stage, and once done the transfer report, pictures and the
// reduced 3D preview (short-lived URLs).
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { getTrial } from '@/lib/market/fitting';
import type { PresetTransferResponse } from '@/lib/market/types';

export function GET(_request: Request, { params }: { params: Promise<{ trialId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) =>
    jsonData<PresetTransferResponse>({ transfer: await getTrial(actor, await pathId(params, 'trialId', notFound('trial'))) }),
  );
}
