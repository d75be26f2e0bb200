// Why a sign-in was refused, and what the form says about it. Plain data, so the sign-in form
// (a client component) can show the message for the code next-auth hands back.

/** The window of the per-client limit (failures from one client address across all e-mails). */
export const SIGN_IN_WINDOW_MINUTES = 15;

export type SignInProblem = 'invalid-input' | 'invalid-credentials' | 'email-not-verified' | 'account-disabled' | 'too-many-attempts';

export const SIGN_IN_PROBLEM_MESSAGES: Record<SignInProblem, string> = {
  'invalid-input': 'Enter your e-mail address and password.',
  'invalid-credentials': 'The e-mail address or the password is wrong.',
  'email-not-verified': 'Confirm your e-mail address first: open the link we sent you, or ask for a new one.',
  'account-disabled': 'This account has been switched off by an administrator. Write to the Whorlwind team if you think this is a mistake.',
  'too-many-attempts':
    'Too many failed sign-ins from here. Wait a few minutes (each further failure doubles the wait), or reset your password to sign in now.',
};

export function isSignInProblem(value: string | null | undefined): value is SignInProblem {
  return value !== null && value !== undefined && value in SIGN_IN_PROBLEM_MESSAGES;
}
