// A buyer asks for a refund from the library and the request lands in the admins' refund queue
// with its reason; an admin refunds it (the request closes with the refund) or declines it with an
// answer the buyer gets by e-mail. The checkout keeps the buyer's agreement that a right to cancel
// may end with the download, and the purchase carries it.
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '@/lib/platform/db';
import { stopJobs } from '@/lib/platform/jobs';
import { listLibrary } from '@/lib/market/library';
import { declineRefundRequest, listRefundRequests, requestRefund } from '@/lib/market/payments/refund-requests';
import { refundPurchase } from '@/lib/market/payments/refunds';
import { refundRequestSchema } from '@/lib/market/validation';
import { buyListing, failureOf as failure, insertListing, makePerson, waitFor } from './market-helpers';
import { mailTo } from './helpers';

afterAll(async () => {
  await stopJobs();
  await closeDb();
});

async function bought(label: string, options: { waiveCancellation?: boolean } = {}) {
  const seller = await makePerson(`${label}-seller`, ['groomer']);
  const buyer = await makePerson(`${label}-buyer`, ['buyer']);
  const listingId = await insertListing(seller, { title: `Refund test coat ${label}` });
  const purchaseId = await buyListing(buyer, listingId, options);
  return { seller, buyer, listingId, purchaseId };
}

describe('the agreement at checkout', () => {
  it('is kept with the purchase when the buyer ticked it, and absent when they did not', async () => {
    const agreed = await bought('agreed', { waiveCancellation: true });
    const silent = await bought('silent');
    const rows = await db()('purchases').whereIn('id', [agreed.purchaseId, silent.purchaseId]).select('id', 'cancellation_waived_at', 'created_at');
    const byId = new Map(rows.map((row) => [row.id, row]));
    expect(byId.get(agreed.purchaseId)!.cancellation_waived_at).toBeInstanceOf(Date);
    expect(byId.get(silent.purchaseId)!.cancellation_waived_at).toBeNull();
    expect((await listLibrary(agreed.buyer))[0]).toMatchObject({ purchaseId: agreed.purchaseId, cancellationWaived: true });
    expect((await listLibrary(silent.buyer))[0]).toMatchObject({ purchaseId: silent.purchaseId, cancellationWaived: false });
  });
});

describe('a refund request', () => {
  it('lands in the admins’ queue with its reason, once, and only from the purchase’s buyer', async () => {
    const { buyer, seller, purchaseId } = await bought('queue', { waiveCancellation: true });
    const reason = 'The coat parts the wrong way on my character’s back.';
    expect((await failure(requestRefund(seller, purchaseId, reason))).status).toBe(404);

    const request = await requestRefund(buyer, purchaseId, reason);
    expect(request).toMatchObject({ reason, outcome: null, answer: null });
    const queued = (await listRefundRequests()).find((entry) => entry.id === request.id);
    expect(queued).toMatchObject({ reason, cancellationWaived: true, downloads: 0, purchase: { id: purchaseId, status: 'paid', buyer: { email: buyer.email } } });

    const again = await failure(requestRefund(buyer, purchaseId, 'Asking a second time, louder.'));
    expect([again.status, again.code]).toEqual([409, 'refund-pending']);
    expect((await listLibrary(buyer))[0].refundRequest).toMatchObject({ id: request.id, reason, outcome: null });
  });

  it('needs a reason the admins can act on', () => {
    const parsed = refundRequestSchema.safeParse({ reason: '  meh ' });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0].message).toMatch(/why you ask for a refund/);
  });

  it('closes as refunded when an admin refunds the purchase, and leaves the queue', async () => {
    const { buyer, purchaseId } = await bought('refunded');
    const admin = await makePerson('refund-admin', ['admin']);
    const request = await requestRefund(buyer, purchaseId, 'Bought the wrong coat length by mistake.');
    await refundPurchase(admin, purchaseId, 'As the buyer asked.');
    expect((await listRefundRequests()).map((entry) => entry.id)).not.toContain(request.id);
    expect((await listLibrary(buyer))[0].refundRequest).toMatchObject({ id: request.id, outcome: 'refunded' });
    expect((await failure(requestRefund(buyer, purchaseId, 'And once more, please.'))).code).toBe('refund-pending');
  });

  it('when declined, sends the buyer the answer, leaves the queue, and may be asked again', async () => {
    const { buyer, purchaseId } = await bought('declined');
    const admin = await makePerson('decline-admin', ['admin']);
    const request = await requestRefund(buyer, purchaseId, 'I changed my mind after downloading.');
    const answer = 'You agreed at checkout that cancelling ends with the download, and downloaded it.';
    expect(await declineRefundRequest(admin, request.id, answer)).toMatchObject({ outcome: 'declined', answer });
    expect((await failure(declineRefundRequest(admin, request.id, answer))).code).toBe('wrong-state');
    expect((await listRefundRequests()).map((entry) => entry.id)).not.toContain(request.id);
    const mail = await waitFor('the answer by mail', async () => (await mailTo(buyer.email!)).find((m) => m.subject.includes('refund request')));
    expect(mail.text).toContain(answer);
    expect((await listLibrary(buyer))[0].refundRequest).toMatchObject({ outcome: 'declined', answer });
    const second = await requestRefund(buyer, purchaseId, 'The files were broken when I opened them.');
    expect((await listRefundRequests()).map((entry) => entry.id)).toContain(second.id);
  });
});
