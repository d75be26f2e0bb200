// GET: the buyers' refund requests waiting for an admin, oldest first (200).
import { handler, jsonData } from '@/lib/http/server';
import { listRefundRequests } from '@/lib/market/payments/refund-requests';
import type { AdminRefundRequestsResponse } from '@/lib/market/types';

export function GET() {
  return handler(['admin'], async () => jsonData<AdminRefundRequestsResponse>({ requests: await listRefundRequests() }));
}
