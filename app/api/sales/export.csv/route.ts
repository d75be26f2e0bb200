// GET: the seller's figures as CSV (same query as /api/sales), one row per period and listing.
import { handler, parseInput, queryOf } from '@/lib/http/server';
import { salesCsv } from '@/lib/market/sales';
import { attachmentDisposition } from '@/lib/platform/storage';
import { salesQuerySchema } from '@/lib/market/validation';

export function GET(request: Request) {
  return handler(['groomer'], async (actor) => {
    const { fileName, text } = await salesCsv(actor, parseInput(salesQuerySchema, queryOf(request)));
    return new Response(text, {
      headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': attachmentDisposition(fileName), 'cache-control': 'no-store' },
    });
  });
}
