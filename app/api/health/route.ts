// Answers 200 when the server can reach its database; the task scripts wait on it.
import { db } from '@/lib/platform/db';
import { jsonData, jsonError } from '@/lib/http/server';

export type HealthResponse = { database: 'reachable' };

export async function GET() {
  try {
    await db().raw('SELECT 1');
    return jsonData<HealthResponse>({ database: 'reachable' });
  } catch (error) {
    console.error('health check: the database cannot be reached', error);
    return jsonError(503, 'service-unavailable', 'The database cannot be reached.');
  }
}
