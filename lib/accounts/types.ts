// The shapes the account route handlers answer with, shared with the account forms. Types only,
// so client components can import them without pulling in next-auth or the database.

/** POST /api/account/sign-up (201): the address the confirmation link went to. */
export type SignUpResponse = { email: string };
/** POST /api/account/verification: the same answer whether or not the address has an account. */
export type ResendVerificationResponse = { email: string };
/** POST /api/account/password-reset: the same answer whether or not the address has an account. */
export type PasswordResetRequestResponse = { email: string };
/** POST /api/account/password-reset/confirm: the account whose password changed. */
export type PasswordResetConfirmResponse = { email: string };
