// The market's e-mails: listing approved or rejected (to the seller), receipt (to the buyer),
// sale notice (to the seller), refund notices (to the buyer and to the seller). Plain text with a simple HTML twin.
import { env } from '../platform/env';
import { escapeHtml } from '../platform/html';
import { sendMail, type OutgoingMail } from '../platform/mail';
import { TAX_NOTE, formatPrice } from './vocabulary';

const link = (path: string) => `${env().NEXTAUTH_URL.replace(/\/$/, '')}${path}`;

function mail(to: string, subject: string, paragraphs: string[]): OutgoingMail {
  const text = `${paragraphs.join('\n\n')}\n\n— Whorlwind market\n`;
  const html = `${paragraphs.map((p) => `<p>${escapeHtml(p).replace(/\n/g, '<br>').replace(/(https?:\/\/\S+)/g, '<a href="$1">$1</a>')}</p>`).join('')}<p>— Whorlwind market</p>`;
  return { to, subject, text, html };
}

export function listingApprovedMail(to: string, listing: { id: string; title: string; priceCents: number; currency: string }) {
  return mail(to, `Your preset “${listing.title}” is on the market`, [
    `Good news: “${listing.title}” was approved and is now published at ${formatPrice(listing.priceCents, listing.currency)}.`,
    `See it as buyers do: ${link(`/market/${listing.id}`)}`,
    `Sales, downloads and payouts are under Sales: ${link('/sales')}`,
  ]);
}

export function listingRejectedMail(to: string, listing: { id: string; title: string }, reason: string) {
  return mail(to, `Your preset “${listing.title}” needs changes`, [
    `“${listing.title}” was not approved for the market yet. The reviewer's reason:`,
    reason,
    `Edit the listing and submit it again: ${link(`/market/${listing.id}`)}`,
  ]);
}

type SaleFacts = { listingId: string; title: string; amountCents: number; currency: string; feeCents: number; licenceTitle: string; purchaseId: string };

export function receiptMail(to: string, sale: SaleFacts) {
  return mail(to, `Receipt: ${sale.title}`, [
    `Thank you for your purchase on the Whorlwind market.`,
    `Preset: ${sale.title}\nLicence: ${sale.licenceTitle}\nPaid: ${formatPrice(sale.amountCents, sale.currency)}\nPurchase: ${sale.purchaseId}`,
    `Download the files from your library: ${link('/library')}`,
    `The licence is in the package as LICENCE.txt and on the preset's page.`,
    TAX_NOTE,
  ]);
}

export function saleNoticeMail(to: string, sale: SaleFacts) {
  return mail(to, `You sold “${sale.title}”`, [
    `“${sale.title}” was bought for ${formatPrice(sale.amountCents, sale.currency)}.`,
    `Market fee: ${formatPrice(sale.feeCents, sale.currency)}. Yours: ${formatPrice(sale.amountCents - sale.feeCents, sale.currency)}.`,
    `Your figures and payouts: ${link('/sales')}`,
    TAX_NOTE,
  ]);
}

export function refundMail(to: string, sale: { title: string; amountCents: number; currency: string }) {
  return mail(to, `Refund: ${sale.title}`, [
    `Your purchase of “${sale.title}” was refunded: ${formatPrice(sale.amountCents, sale.currency)} go back to the card you paid with.`,
    `The preset's licence ends with the refund, and its files are no longer in your library.`,
  ]);
}

/** The seller is told of every refund, and what it does to their balance. */
export function saleRefundedMail(to: string, sale: SaleFacts & { paidOut: boolean }) {
  const net = formatPrice(sale.amountCents - sale.feeCents, sale.currency);
  return mail(to, `A sale of “${sale.title}” was refunded`, [
    `The purchase of “${sale.title}” (${formatPrice(sale.amountCents, sale.currency)}, purchase ${sale.purchaseId}) was refunded to the buyer. The market gives back its fee; your share of ${net} comes off your balance.`,
    sale.paidOut
      ? `This sale was already paid out to you, so your balance shows ${net} owed. Nothing is taken from your bank account: the amount is kept back from your next sales before anything more is paid out.`
      : `It had not been paid out yet, so nothing is owed: it simply leaves your balance.`,
    `Your balance and payouts: ${link('/sales')}`,
    TAX_NOTE,
  ]);
}

/** Sends and reports a failure in the server log instead of throwing (for mail after a commit). */
export async function sendMailLogged(message: OutgoingMail): Promise<boolean> {
  try {
    await sendMail(message);
    return true;
  } catch (error) {
    console.error(`[market] ${(error as Error).message}`);
    return false;
  }
}

// Listing versions: the seller hears of the admins' decision on an update, and every owner of the
// listing (paid, not refunded) of an approved one.

export function listingVersionApprovedMail(to: string, version: { listingId: string; title: string; number: number; owners: number }) {
  return mail(to, `Version ${version.number} of “${version.title}” is on the market`, [
    `Version ${version.number} of “${version.title}” was approved: the market shows it now, and it is what new buyers get.`,
    version.owners === 0
      ? 'Nobody owns the preset yet.'
      : `${version.owners === 1 ? 'Its one owner gets' : `Its ${version.owners} owners get`} it free in their library, with a notice; the version each bought stays theirs too.`,
    `See it as buyers do: ${link(`/market/${version.listingId}`)}`,
  ]);
}

export function listingVersionRejectedMail(to: string, version: { listingId: string; title: string; number: number }, reason: string) {
  return mail(to, `Version ${version.number} of “${version.title}” needs changes`, [
    `Version ${version.number} of “${version.title}” was not approved. The version on sale stays as it is. The reviewer's reason:`,
    reason,
    `Publish a corrected version: ${link(`/sales/listings/${version.listingId}/versions/new`)}`,
  ]);
}

/** To an owner of a listing whose new version was approved: theirs at no cost. */
export function ownerUpdateMail(to: string, version: { title: string; number: number; notes: string; boughtNumber: number }) {
  return mail(to, `“${version.title}” has a new version for you`, [
    `The seller of “${version.title}” published version ${version.number}. As an owner you get it at no cost: it is in your library now.`,
    ...(version.notes ? [`What changed, in the seller's words:\n${version.notes}`] : []),
    `The version you bought (version ${version.boughtNumber}) stays in your library too, under the same licence.`,
    `Your library: ${link('/library')}`,
  ]);
}
