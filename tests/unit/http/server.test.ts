// The one HTTP layer of the route handlers, without a session: ids from the path, the JSON body,
// the query, and HttpErrors answered in the envelope.
import { describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { HttpError } from '@/lib/http/errors';
import { handler, pathId, queryOf, readBody } from '@/lib/http/server';

const schema = z.object({ name: z.string().min(1, 'Give a name.'), note: z.string().optional() });
const post = (body: string) => new Request('http://localhost/api/thing', { method: 'POST', body });
const missing = new HttpError(404, 'not-found', 'There is no such thing.');

async function failure(promise: Promise<unknown>): Promise<HttpError> {
  const error = await promise.then(() => null, (caught: unknown) => caught);
  expect(error).toBeInstanceOf(HttpError);
  return error as HttpError;
}

describe('pathId', () => {
  it('gives a uuid lower-cased, and the missing error for anything else', async () => {
    const id = 'A0EEBC99-9C0B-4EF8-BB6D-6BB9BD380A11';
    expect(await pathId(Promise.resolve({ id }), 'id', missing)).toBe(id.toLowerCase());
    expect(await failure(pathId(Promise.resolve({ id: 'not-an-id' }), 'id', missing))).toBe(missing);
  });
});

describe('readBody', () => {
  it('validates JSON, with a message per field', async () => {
    expect(await readBody(post('{"name":"Loop"}'), schema)).toEqual({ name: 'Loop' });
    const error = await failure(readBody(post('{"name":""}'), schema));
    expect(error).toMatchObject({ status: 400, code: 'invalid-input', message: 'Some fields need another look.', extra: { fields: { name: 'Give a name.' } } });
  });

  it('refuses a body that is not JSON, and reads an empty body as {}', async () => {
    expect(await failure(readBody(post('{"name": '), schema))).toMatchObject({ status: 400, message: 'The request body must be JSON.' });
    expect(await readBody(post(''), z.object({ reason: z.string().optional() }))).toEqual({});
  });
});

describe('queryOf', () => {
  it('keeps one value as a string and a repeated key as a list', () => {
    expect(queryOf(new Request('http://localhost/s?q=plush&format=obj&format=glb'))).toEqual({ q: 'plush', format: ['obj', 'glb'] });
  });
});

describe("handler('none')", () => {
  it('answers the work, or its HttpError in the envelope; other errors are a plain 500 (unexpected-error.test.ts)', async () => {
    const ok = await handler('none', async () => Response.json({ data: 1 }));
    expect(await ok.json()).toEqual({ data: 1 });
    const refused = await handler('none', async () => {
      throw new HttpError(409, 'wrong-state', 'Not now.', { details: { state: 'draft' } });
    });
    expect(refused.status).toBe(409);
    expect(await refused.json()).toEqual({ error: { code: 'wrong-state', message: 'Not now.', details: { state: 'draft' } } });
    const spy = vi.spyOn(console, 'error').mockImplementation(() => {});
    expect((await handler('none', async () => Promise.reject(new Error('boom')))).status).toBe(500);
    spy.mockRestore();
  });
});
