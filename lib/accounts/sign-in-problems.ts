// Why a sign-in was refused, and what the form says about it. Plain data, so the sign-in form
// (a client component) can show the message for the code next-auth hands back.

export const SIGN_IN_WINDOW_MINUTES = 15;

export type SignInProblem = 'invalid-input' | 'invalid-credentials' | 'email-not-verified' | 'too-many-attempts';

export const SIGN_IN_PROBLEM_MESSAGES: Record<SignInProblem, string> = {
  'invalid-input': 'Enter your e-mail address and password.',
  'invalid-credentials': 'The e-mail address or the password is wrong.',
  'email-not-verified': 'Confirm your e-mail address first: open the link we sent you, or ask for a new one.',
  'too-many-attempts': `Too many failed sign-ins. Wait ${SIGN_IN_WINDOW_MINUTES} minutes, or reset your password to sign in now.`,
};

export function isSignInProblem(value: string | null | undefined): value is SignInProblem {
  return value !== null && value !== undefined && value in SIGN_IN_PROBLEM_MESSAGES;
}
