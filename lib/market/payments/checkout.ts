// Checkout: a Checkout Session at the payment provider for one published listing, with the price
// taken from the database. A buyer cannot buy their own listing or one they already own; a second
// click while a checkout is open returns the same checkout instead of a second payment.
import { db, lockUntilCommit } from '../../platform/db';
import { env } from '../../platform/env';
import { payments } from '../../platform/payments';
import { HttpError } from '../../http/errors';
import { notFound, providerFailed } from '../errors';
import { platformFeeCents } from '../fees';
import type { Actor } from '../../accounts/actor';

/** How long a checkout stays payable (the provider's minimum is 30 minutes). */
const CHECKOUT_MINUTES = 60;
/** An open checkout is reused only while it has at least this long left. */
const REUSE_MARGIN_MINUTES = 10;

const appUrl = (path: string) => `${env().NEXTAUTH_URL.replace(/\/$/, '')}${path}`;

export type CheckoutStart = { url: string; sessionId: string; reused: boolean };

/**
 * Opens (or reuses) the buyer's checkout of a listing. `waiveCancellation` is the buyer's agreement,
 * given before paying, that where the law lets a right to cancel a digital purchase end once the
 * download starts, it ends then; it is kept with the checkout (the latest answer wins when an open
 * checkout is reused) and carried onto the purchase it becomes.
 */
export async function startCheckout(actor: Actor, listingId: string, options: { waiveCancellation?: boolean } = {}): Promise<CheckoutStart> {
  const waivedAt = options.waiveCancellation ? new Date() : null;
  return db().transaction(async (trx) => {
    // One checkout decision at a time per buyer and listing (two quick clicks, two tabs).
    await lockUntilCommit(trx, `checkout:${listingId}:${actor.userId}`);
    const listing = await trx('listings').where({ id: listingId }).first('id', 'seller_id', 'state', 'title', 'price_cents', 'currency');
    if (!listing || (listing.state !== 'published' && listing.seller_id !== actor.userId && !actor.roles.includes('admin'))) throw notFound('listing');
    if (listing.seller_id === actor.userId) throw new HttpError(403, 'own-listing', 'This is your own preset: it is already yours to use.');
    if (listing.state !== 'published') throw new HttpError(409, 'not-for-sale', 'This preset is not on sale at the moment.');
    const owned = await trx('purchases').where({ listing_id: listingId, buyer_id: actor.userId, status: 'paid' }).first('id');
    if (owned) {
      throw new HttpError(409, 'already-owned', 'You already own this preset: download it from your library.', { details: { purchaseId: owned.id } });
    }

    const open = await trx('checkout_sessions')
      .where({ listing_id: listingId, buyer_id: actor.userId, amount_cents: listing.price_cents, currency: listing.currency })
      .where('expires_at', '>', trx.raw(`now() + interval '${REUSE_MARGIN_MINUTES} minutes'`))
      .orderBy('created_at', 'desc')
      .first('session_id', 'url');
    if (open) {
      try {
        const session = await payments().checkout.sessions.retrieve(open.session_id);
        if (session.status === 'open' && session.url) {
          await trx('checkout_sessions').where({ session_id: open.session_id }).update({ cancellation_waived_at: waivedAt });
          return { url: session.url, sessionId: session.id, reused: true };
        }
        if (session.status === 'complete') {
          throw new HttpError(409, 'already-owned', 'You have just paid for this preset; it appears in your library in a moment.');
        }
      } catch (error) {
        if (error instanceof HttpError) throw error;
        // The provider forgot it (or is unreachable): fall through to a new checkout.
      }
      await trx('checkout_sessions').where({ session_id: open.session_id }).delete();
    }

    const fee = platformFeeCents(listing.price_cents);
    const metadata = { listing_id: listing.id, buyer_id: actor.userId, seller_id: listing.seller_id, platform_fee_cents: String(fee) };
    const expiresAt = Math.floor(Date.now() / 1000) + CHECKOUT_MINUTES * 60;
    let session;
    try {
      session = await payments().checkout.sessions.create({
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: { currency: listing.currency, unit_amount: listing.price_cents, product_data: { name: listing.title } },
          },
        ],
        client_reference_id: actor.userId,
        ...(actor.email && { customer_email: actor.email }),
        metadata,
        payment_intent_data: { metadata },
        success_url: appUrl(`/library?checkout=success&session_id={CHECKOUT_SESSION_ID}`),
        cancel_url: appUrl(`/market/${listing.id}?checkout=cancelled`),
        expires_at: expiresAt,
      });
    } catch (error) {
      throw providerFailed('open a checkout', error);
    }
    if (!session.url) throw providerFailed('open a checkout', new Error('the session has no payment page'));
    await trx('checkout_sessions').insert({
      session_id: session.id,
      listing_id: listing.id,
      buyer_id: actor.userId,
      amount_cents: listing.price_cents,
      currency: listing.currency,
      url: session.url,
      expires_at: new Date(session.expires_at * 1000),
      cancellation_waived_at: waivedAt,
    });
    return { url: session.url, sessionId: session.id, reused: false };
  });
}
