// The preset a checkout was opened for, kept in the tab (sessionStorage) while the browser is on
// the payment provider's page, so the page it returns to knows which purchase to wait for.
const KEY = 'whorlwind:pending-checkout';

export type PendingCheckout = { listingId: string; title: string; startedAt: string };

export function rememberCheckout(checkout: Omit<PendingCheckout, 'startedAt'>) {
  try {
    sessionStorage.setItem(KEY, JSON.stringify({ ...checkout, startedAt: new Date().toISOString() }));
  } catch {
    // Storage may be off; the return page then waits for any new purchase.
  }
}

export function pendingCheckout(): PendingCheckout | null {
  try {
    const text = sessionStorage.getItem(KEY);
    return text ? (JSON.parse(text) as PendingCheckout) : null;
  } catch {
    return null;
  }
}

export function forgetCheckout() {
  try {
    sessionStorage.removeItem(KEY);
  } catch {
    // nothing to forget
  }
}
