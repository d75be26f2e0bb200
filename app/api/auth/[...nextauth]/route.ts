// next-auth's own endpoints (csrf, session, sign-in callback, sign-out).
import NextAuth from 'next-auth';
import type { NextRequest } from 'next/server';
import { authOptions } from '@/lib/accounts/session';

type RouteContext = { params: Promise<{ nextauth: string[] }> };

// The options are built per request so the configuration is read when the server runs,
// not when the build loads this module.
function handler(request: NextRequest, context: RouteContext): Promise<Response> {
  return NextAuth(request, context, authOptions());
}

export { handler as GET, handler as POST };
