// GET: a fit of a bought preset as it stands — its stage, and once done the transfer report.
import { handler, jsonData, pathId } from '@/lib/http/server';
import { notFound } from '@/lib/market/errors';
import { getFit } from '@/lib/market/fitting';
import type { PresetTransferResponse } from '@/lib/market/types';

export function GET(_request: Request, { params }: { params: Promise<{ fitId: string }> }) {
  return handler(['buyer', 'groomer'], async (actor) =>
    jsonData<PresetTransferResponse>({ transfer: await getFit(actor, await pathId(params, 'fitId', notFound('fit'))) }),
  );
}
