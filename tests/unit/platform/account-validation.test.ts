import { describe, expect, it } from 'vitest';
import { fieldErrors } from '@/lib/http/field-errors';
import { resetPasswordSchema, signUpSchema } from '@/lib/accounts/schemas';
import { safeCallbackPath } from '@/lib/accounts/safe-callback';

const valid = { displayName: 'Ottilie Fenwick', email: 'Ottilie@Example.COM ', password: 'guard-hairs-01', role: 'groomer' };

function messages(input: unknown) {
  const result = signUpSchema.safeParse(input);
  return result.success ? {} : fieldErrors(result.error);
}

describe('sign-up input', () => {
  it('accepts a complete form and normalises the address', () => {
    const parsed = signUpSchema.parse(valid);
    expect(parsed.email).toBe('ottilie@example.com');
  });

  it('names each field that is wrong', () => {
    expect(messages({ ...valid, password: 'short' })).toEqual({ password: 'Use at least 10 characters.' });
    expect(messages({ ...valid, email: 'ottilie.example.com' })).toEqual({
      email: 'This does not look like an e-mail address (name@example.com).',
    });
    expect(messages({ ...valid, displayName: '   ' })).toEqual({ displayName: 'Enter the name other people will see.' });
    expect(messages({ ...valid, role: 'admin' })).toEqual({ role: 'Choose whether you groom or only buy.' });
    expect(Object.keys(messages({}))).toEqual(['displayName', 'email', 'password', 'role']);
  });

  it('refuses passwords that bcrypt would cut short', () => {
    expect(messages({ ...valid, password: 'ü'.repeat(40) }).password).toMatch(/at most 72 bytes/);
    expect(messages({ ...valid, password: 'a'.repeat(72) })).toEqual({});
  });
});

describe('reset input', () => {
  it('refuses a token that cannot be one of ours', () => {
    const result = resetPasswordSchema.safeParse({ token: 'abc', password: 'guard-hairs-01' });
    expect(result.success).toBe(false);
    expect(fieldErrors(result.error!).token).toMatch(/not valid/);
  });
});

describe('where to go after signing in', () => {
  it('keeps paths on this site and drops everything else', () => {
    expect(safeCallbackPath('/studio')).toBe('/studio');
    expect(safeCallbackPath(undefined)).toBe('/');
    expect(safeCallbackPath('https://elsewhere.example/')).toBe('/');
    expect(safeCallbackPath('//elsewhere.example')).toBe('/');
    expect(safeCallbackPath('/\\elsewhere.example')).toBe('/');
  });
});
