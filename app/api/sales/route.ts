// GET ?from=YYYY-MM-DD&to=YYYY-MM-DD&bucket=day|week|month: the seller's figures per currency.
import { handler, jsonData, parseInput, queryOf } from '@/lib/http/server';
import { salesReport } from '@/lib/market/sales';
import type { SalesResponse } from '@/lib/market/types';
import { salesQuerySchema } from '@/lib/market/validation';

export function GET(request: Request) {
  return handler(['groomer'], async (actor) => jsonData<SalesResponse>(await salesReport(actor, parseInput(salesQuerySchema, queryOf(request)))));
}
