// GET ?from=YYYY-MM-DD&to=YYYY-MM-DD&bucket=day|week|month: the seller's figures per currency.
import { marketData, marketHandler, parseInput, queryOf } from '@/lib/market/http';
import { salesReport } from '@/lib/market/sales';
import type { SalesReport } from '@/lib/market/types';
import { salesQuerySchema } from '@/lib/market/validation';

export type SalesResponse = SalesReport;

export function GET(request: Request) {
  return marketHandler(['groomer'], async (actor) => marketData<SalesResponse>(await salesReport(actor, parseInput(salesQuerySchema, queryOf(request)))));
}
