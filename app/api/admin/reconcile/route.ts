// POST: asks the payment provider for the completed checkouts of the last three days and records
// the purchases whose webhook never arrived. The same runs every ten minutes as a job.
import { marketData, marketHandler } from '@/lib/market/http';
import { reconcilePayments } from '@/lib/market/reconcile';

export type ReconcileResponse = { recovered: number; checked: number };

export function POST() {
  return marketHandler(['admin'], async () => marketData<ReconcileResponse>(await reconcilePayments()));
}
