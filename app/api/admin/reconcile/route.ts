// POST: asks the payment provider for the completed checkouts of the last three days and records
// the purchases whose webhook never arrived. The same runs every ten minutes as a job.
import { handler, jsonData } from '@/lib/http/server';
import { reconcilePayments } from '@/lib/market/payments/reconcile';
import type { ReconcileResponse } from '@/lib/market/types';

export function POST() {
  return handler(['admin'], async () => jsonData<ReconcileResponse>(await reconcilePayments()));
}
