// Answers 200 when the server can reach its database; the task scripts wait on it.
import { HttpError } from '@/lib/http/errors';
import { handler, jsonData } from '@/lib/http/server';
import { db } from '@/lib/platform/db';
import type { HealthResponse } from '@/lib/platform/types';

export function GET() {
  return handler('none', async () => {
    try {
      await db().raw('SELECT 1');
    } catch (error) {
      console.error('health check: the database cannot be reached', error);
      throw new HttpError(503, 'service-unavailable', 'The database cannot be reached.');
    }
    return jsonData<HealthResponse>({ database: 'reachable' });
  });
}
