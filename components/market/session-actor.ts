// The person a page acts for when it reads through lib/market (server components only).
import type { SignedInSession } from '@/lib/accounts/session';
import type { Actor } from '@/lib/market/http';

export function actorOf(session: SignedInSession): Actor {
  return { userId: session.user.id, roles: session.user.roles, email: session.user.email ?? null };
}
