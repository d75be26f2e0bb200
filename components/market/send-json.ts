// PUT and PATCH for the market's forms, answering like postJson (lib/http/client.ts): a result,
// never a throw. (The platform's helper only posts.)
import type { ApiError } from '@/lib/http/types';
import type { ApiOutcome } from '@/lib/http/client';

export async function sendJson<T>(method: 'PUT' | 'PATCH', url: string, body: unknown): Promise<ApiOutcome<T>> {
  let response: Response;
  try {
    response = await fetch(url, { method, headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
  } catch {
    return { ok: false, error: { code: 'service-unavailable', message: 'Whorlwind could not be reached. Check your connection and try again.' } };
  }
  const envelope = (await response.json().catch(() => null)) as { data: T } | { error: ApiError } | null;
  if (!envelope) return { ok: false, error: { code: 'service-unavailable', message: `The server answered ${response.status} without details.` } };
  return 'error' in envelope ? { ok: false, error: envelope.error } : { ok: true, data: envelope.data };
}
