// Sign-in with next-auth: e-mail and password (credentials provider), JWT sessions with the
// user's roles in the token, and the server-side check that pages use (route handlers check in
// lib/http/server.ts).
import type { NextAuthOptions, Session } from 'next-auth';
import { getServerSession } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { forbidden, redirect } from 'next/navigation';
import { env } from '../platform/env';
import { checkCredentials } from './sign-in';
import { area, isRole, mayEnter, type AreaId, type Role } from './roles';

// The address the proxy in front of the app reports. A client can forge these headers, so the
// per-client limit only slows down spraying; the per-address limit is what protects an account.
function clientAddress(headers: Record<string, string | string[] | undefined> | undefined): string | null {
  const forwarded = headers?.['x-forwarded-for'];
  const first = (Array.isArray(forwarded) ? forwarded[0] : forwarded)?.split(',')[0]?.trim();
  const real = headers?.['x-real-ip'];
  return first || (typeof real === 'string' ? real : null);
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
          const result = await checkCredentials(credentials, clientAddress(request?.headers));
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
          token.roles = user.roles;
        }
        return token;
      },
      async session({ session, token }) {
        if (session.user) {
          session.user.id = token.sub ?? '';
          session.user.roles = (token.roles ?? []).filter(isRole);
        }
        return session;
      },
    },
  };
}

export type SignedInSession = Session & { user: NonNullable<Session['user']> & { id: string; roles: Role[] } };

export async function currentSession(): Promise<SignedInSession | null> {
  const session = await getServerSession(authOptions());
  if (!session?.user?.id) return null;
  return session as SignedInSession;
}

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
