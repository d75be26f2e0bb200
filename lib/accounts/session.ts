// Sign-in with next-auth: e-mail and password (credentials provider) and JWT sessions. A token
// names the user and the session version it was issued under; at every use (next-auth's `jwt`
// callback, run for each session read) the account is read again: a user that does not exist, is
// disabled, or whose version moved on (password reset, disabling) has no session, and the roles are
// the ones in the database now, so a role change applies at once. Pages check with requireArea;
// route handlers check in lib/http/server.ts; both go through currentSession.
import type { NextAuthOptions, Session } from 'next-auth';
import { getServerSession } from 'next-auth';
import { cache } from 'react';
import CredentialsProvider from 'next-auth/providers/credentials';
import { cookies } from 'next/headers';
import { forbidden, redirect } from 'next/navigation';
import { env } from '../platform/env';
import { clientAddressOf } from './client-address';
import { liveAccount } from './live-account';
import { checkCredentials } from './sign-in';
import { area, mayEnter, type AreaId, type Role } from './roles';

/** Thrown by the `jwt` callback for a token that no longer opens a session; next-auth then clears the cookie. */
class SessionEnded extends Error {
  constructor() {
    super('The session has ended: the account is gone or disabled, or its password changed since.');
    this.name = 'SessionEnded';
  }
}

export function authOptions(): NextAuthOptions {
  return {
    secret: env().NEXTAUTH_SECRET,
    session: { strategy: 'jwt', maxAge: 7 * 24 * 60 * 60 },
    pages: { signIn: '/signin', error: '/signin' },
    providers: [
      CredentialsProvider({
        name: 'E-mail and password',
        credentials: {
          email: { label: 'E-mail', type: 'email' },
          password: { label: 'Password', type: 'password' },
        },
        async authorize(credentials, request) {
          const result = await checkCredentials(credentials, clientAddressOf(request?.headers));
          // next-auth hands the message of a thrown error to the sign-in form as `error`.
          if (!result.ok) throw new Error(result.problem);
          return result.user;
        },
      }),
    ],
    callbacks: {
      async jwt({ token, user }) {
        if (user) {
          token.sub = user.id;
          token.sessionVersion = user.sessionVersion;
        }
        const account = token.sub && typeof token.sessionVersion === 'number' ? await liveAccount(token.sub, token.sessionVersion) : null;
        if (!account) throw new SessionEnded();
        token.roles = account.roles;
        token.email = account.email;
        token.name = account.name;
        return token;
      },
      async session({ session, token }) {
        session.user = { id: token.sub ?? '', email: token.email, name: token.name, roles: token.roles ?? [] };
        return session;
      },
    },
    logger: {
      // An ended session is an answer (signed out), not a fault of the server: keep it out of the error log.
      error(code, metadata) {
        const error = metadata instanceof Error ? metadata : (metadata as { error?: unknown })?.error;
        if (error instanceof SessionEnded) return;
        console.error(`[next-auth][error][${code}]`, metadata);
      },
      warn(code) {
        console.warn(`[next-auth][warn][${code}]`);
      },
      debug() {},
    },
  };
}

export type SignedInSession = Session & { user: NonNullable<Session['user']> & { id: string; roles: Role[] } };

// getServerSession's form for API routes, given the request's cookies and a response that drops
// what it sets: a refreshed or cleared cookie reaches the browser through /api/auth/session.
const DISCARDED_RESPONSE = { getHeader() {}, setCookie() {}, setHeader() {} };

/** The session the cookies open, checked against the database; null when they open none. */
export async function sessionOfCookies(cookieValues: Record<string, string>): Promise<SignedInSession | null> {
  const request = { cookies: cookieValues, headers: {} };
  const session = await getServerSession(request as never, DISCARDED_RESPONSE as never, authOptions());
  if (!session?.user?.id) return null;
  return session as SignedInSession;
}

/**
 * The session of the request being answered (pages, server components, route handlers). Each read
 * checks the account in the database, so within one server render (the header, then the page's
 * requireArea) React's cache() makes it one read.
 */
export const currentSession = cache(async (): Promise<SignedInSession | null> => {
  const jar = await cookies();
  return sessionOfCookies(Object.fromEntries(jar.getAll().map((cookie) => [cookie.name, cookie.value])));
});

/**
 * For pages of an area: sends visitors who are not signed in to the sign-in page (and back here
 * afterwards), and answers 403 with the forbidden page to those whose roles do not allow it.
 */
export async function requireArea(areaId: AreaId): Promise<SignedInSession | null> {
  const target = area(areaId);
  const session = await currentSession();
  if (target.allowed === 'anyone') return session;
  if (!session) redirect(`/signin?callbackUrl=${encodeURIComponent(target.href)}`);
  if (!mayEnter(target, session.user.roles)) forbidden();
  return session;
}
