// An error that is not an HttpError (a database's, a provider's) is answered with a plain 500:
// its text names tables, hosts and values, and goes to the server's log only.
import { afterEach, describe, expect, it, vi } from 'vitest';
import { handler } from '@/lib/http/server';
import { providerFailed } from '@/lib/market/errors';

afterEach(() => vi.restoreAllMocks());

describe('unexpected errors in a route handler', () => {
  it('answer 500 with a plain message and a reference, and log the detail', async () => {
    const log = vi.spyOn(console, 'error').mockImplementation(() => {});
    const leak = 'duplicate key value violates unique constraint "users_email_unique" on host db-7.internal';
    const response = await handler('none', async () => {
      throw new Error(leak);
    });
    expect(response.status).toBe(500);
    const body = await response.json();
    expect(body.error.code).toBe('server-error');
    expect(body.error.message).toMatch(/^Something went wrong on our side/);
    expect(JSON.stringify(body)).not.toMatch(/users_email_unique|db-7/);
    expect(log).toHaveBeenCalledOnce();
    expect(String(log.mock.calls[0][0])).toContain(body.error.details.reference);
    expect((log.mock.calls[0][1] as Error).message).toBe(leak);
  });

  it("keep the payment provider's own text out of its 502", async () => {
    vi.spyOn(console, 'error').mockImplementation(() => {});
    const error = providerFailed('refund the payment', new Error('No such charge: ch_3Pq; request req_8xK (acct_1Ab)'));
    expect(error.status).toBe(502);
    expect(error.message).toBe('The payment provider could not refund the payment: it refused the request. Try again in a few minutes.');
    expect(JSON.stringify({ message: error.message, extra: error.extra })).not.toMatch(/ch_3Pq|req_8xK|acct_1Ab/);
  });
});
