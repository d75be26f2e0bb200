// The person a server call acts for, as the areas' logic sees them: taken from the session by the
// route handlers (lib/http/server.ts) and by server components, in one way.
import type { Role } from './roles';
import type { SignedInSession } from './session';

export type Actor = { userId: string; roles: readonly Role[]; email: string | null };

/** The signed-in person of a session, with their roles as the database holds them now (session.ts). */
export function actorOf(session: SignedInSession): Actor {
  return { userId: session.user.id, roles: session.user.roles, email: session.user.email ?? null };
}

/** Whom the studio acts for: only the groomer's id matters there (their own surfaces and grooms). */
export type Groomer = Pick<Actor, 'userId'>;
