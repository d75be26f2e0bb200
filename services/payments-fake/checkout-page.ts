// The hosted checkout page at a session's `url`: what the buyer's browser sees (no API key).
// Test cards decide the outcome:
//   4242 4242 4242 4242  succeeds
//   4000 0000 0000 0002  declined (card_declined)
//   4000 0000 0000 9995  declined (insufficient_funds)
import { escapeHtml } from '../../lib/platform/html';
import { expireIfDue, pay } from './checkout';
import { formatMoney, newId, type Session } from './objects';
import type { PaymentsFakeState } from './state';
import { emit } from './webhooks';

const DECLINES: Record<string, { code: string; message: string }> = {
  '4000000000000002': { code: 'card_declined', message: 'Your card was declined.' },
  '4000000000009995': { code: 'insufficient_funds', message: 'Your card has insufficient funds.' },
};
const SUCCEEDS = new Set(['4242424242424242']);

function checkoutPage(session: Session, notice?: { kind: 'error' | 'info'; text: string }) {
  const items = session.line_items_summary
    .map((item) => `<li>${escapeHtml(item.name)} × ${item.quantity} — ${formatMoney(item.unit_amount * item.quantity, session.currency)}</li>`)
    .join('');
  const body =
    session.status === 'open'
      ? `<form method="post" action="/pay/${session.id}">
  <label>Card number <input name="card" inputmode="numeric" autocomplete="cc-number" value="" required></label>
  <label>Expiry (MM/YY) <input name="expiry" value="12/34" required></label>
  <label>CVC <input name="cvc" value="123" required></label>
  <button type="submit">Pay ${formatMoney(session.amount_total, session.currency)}</button>
</form>
${session.cancel_url ? `<p><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ''}
<p class="hint">Test cards: 4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined; 4000 0000 0000 9995 has insufficient funds.</p>`
      : `<p>This checkout is ${session.status === 'complete' ? 'already paid' : 'no longer open (it expired)'}.</p>`;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Pay — local payments stand-in</title>
<style>body{font:16px system-ui,sans-serif;max-width:28rem;margin:3rem auto;padding:0 1rem}label{display:block;margin:.6rem 0}input{display:block;width:100%;padding:.4rem}button{margin-top:1rem;padding:.6rem 1rem}.error{color:#a00}.hint{color:#555;font-size:.85rem}</style>
</head><body>
<h1>Checkout</h1>
<p>A local stand-in for the payment provider: no money moves.</p>
<ul>${items}</ul>
<p><strong>Total: ${formatMoney(session.amount_total, session.currency)}</strong></p>
${notice ? `<p class="${notice.kind}" role="alert">${escapeHtml(notice.text)}</p>` : ''}
${body}
</body></html>`;
}

/** What the page answers: a page with its status, or the redirect to `success_url` after paying. */
export type PageAnswer = { status: number; page: string } | { redirect: string };

/**
 * GET shows the session's page; POST pays it with the form's `card`: a test card that succeeds
 * pays the session and redirects, a declining one records `payment_intent.payment_failed` and
 * answers 402, anything else 400; a session no longer open answers 409, an unknown one 404.
 */
export function answerPayPage(state: PaymentsFakeState, method: string, sessionId: string, body: string): PageAnswer {
  const session = state.sessions.get(sessionId);
  if (!session) return { status: 404, page: '<!doctype html><title>Not found</title><p>There is no such checkout.</p>' };
  expireIfDue(session);
  if (method === 'GET') return { status: 200, page: checkoutPage(session) };
  if (method !== 'POST') return { status: 405, page: '<!doctype html><p>Method not allowed.</p>' };
  if (session.status !== 'open') return { status: 409, page: checkoutPage(session) };
  const card = (new URLSearchParams(body).get('card') ?? '').replace(/[\s-]/g, '');
  const decline = DECLINES[card];
  if (decline) {
    emit(state, 'payment_intent.payment_failed', { id: newId('pi'), object: 'payment_intent', amount: session.amount_total, currency: session.currency, status: 'requires_payment_method', last_payment_error: { code: decline.code, message: decline.message } });
    return { status: 402, page: checkoutPage(session, { kind: 'error', text: decline.message }) };
  }
  if (!SUCCEEDS.has(card)) return { status: 400, page: checkoutPage(session, { kind: 'error', text: 'Use one of the test card numbers below.' }) };
  pay(state, session);
  return { redirect: session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id) };
}
