// The user id, session version and roles that lib/accounts/session.ts puts into the token and the session.
import type { DefaultSession } from 'next-auth';
import type { Role } from '@/lib/accounts/roles';

declare module 'next-auth' {
  interface User {
    roles: Role[];
    /** users.session_version when the user signed in; a token under an older one opens no session. */
    sessionVersion: number;
  }
  interface Session {
    user?: DefaultSession['user'] & { id: string; roles: Role[] };
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    /** Read again from the database at every use of the session. */
    roles?: Role[];
    sessionVersion?: number;
  }
}
