// The shapes the account route handlers answer with, shared with the account forms. Types only,
// so client components can import them without pulling in next-auth or the database.
import type { Role } from './roles';

/** POST /api/account/sign-up (201): the address the mail went to; the same answer whether or not it has an account. */
export type SignUpResponse = { email: string };
/** POST /api/account/verification: the same answer whether or not the address has an account. */
export type ResendVerificationResponse = { email: string };
/** POST /api/account/password-reset: the same answer whether or not the address has an account. */
export type PasswordResetRequestResponse = { email: string };
/** POST /api/account/password-reset/confirm: the account whose password changed. */
export type PasswordResetConfirmResponse = { email: string };
/** GET /api/admin/accounts ({ accounts }) and PATCH /api/admin/accounts/[id]: an account as an admin sees it. */
export type AdminAccount = { id: string; email: string; displayName: string; roles: Role[]; disabled: boolean };
