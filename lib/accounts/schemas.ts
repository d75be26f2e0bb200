// Input rules for accounts, shared by the forms (checked as you type and on submit) and by
// the route handlers (checked again on the server, which is the check that counts).
import { z } from 'zod';
import { SIGN_UP_ROLES } from './roles';

export const PASSWORD_MIN_LENGTH = 10;
// bcrypt only reads the first 72 bytes of a password; longer ones would be silently cut.
const PASSWORD_MAX_BYTES = 72;

export const emailField = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .min(1, 'Enter your e-mail address.')
  .max(254, 'An e-mail address has at most 254 characters.')
  .toLowerCase()
  .pipe(z.email('This does not look like an e-mail address (name@example.com).'));

export const newPasswordField = z
  .string({ error: 'Choose a password.' })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .refine((value) => new TextEncoder().encode(value).length <= PASSWORD_MAX_BYTES, {
    message: `Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} plain letters).`,
  });

export const signUpSchema = z.object({
  displayName: z
    .string({ error: 'Enter the name other people will see.' })
    .trim()
    .min(1, 'Enter the name other people will see.')
    .max(80, 'Use at most 80 characters.'),
  email: emailField,
  password: newPasswordField,
  role: z.enum(SIGN_UP_ROLES, { error: 'Choose whether you groom or only buy.' }),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email: emailField,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const emailOnlySchema = z.object({ email: emailField });

export const tokenField = z
  .string({ error: 'The link has no token.' })
  .regex(/^[A-Za-z0-9_-]{43}$/, 'This link is not valid: it may have been cut off or mistyped.');

export const resetPasswordSchema = z.object({ token: tokenField, password: newPasswordField });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
