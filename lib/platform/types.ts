// The shapes the platform's own route handlers answer with (the health check, the caught mail
// for admins). Types only, so client components can import them.
import type { CaughtMail } from './mail-sink';

/** GET /api/health */
export type HealthResponse = { database: 'reachable' };
/** GET /api/admin/mail: without a configured sink there is nothing to list. */
export type CaughtMailResponse = { configured: false } | { configured: true; messages: CaughtMail[] };
