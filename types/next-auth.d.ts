// The user id and roles that lib/accounts/session.ts puts into the token and the session.
import type { DefaultSession } from 'next-auth';
import type { Role } from '@/lib/accounts/roles';

declare module 'next-auth' {
  interface User {
    roles: Role[];
  }
  interface Session {
    user?: DefaultSession['user'] & { id: string; roles: Role[] };
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    roles?: Role[];
  }
}
