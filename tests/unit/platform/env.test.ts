import { describe, expect, it } from 'vitest';
import { InvalidEnvironment, parseEnv } from '@/lib/platform/env';
import { DEMO_PORTS } from '@/lib/platform/local-services';

describe('server configuration', () => {
  it('defaults to the local demo services', () => {
    const config = parseEnv({});
    expect(config.DATABASE_URL).toContain(`127.0.0.1:${DEMO_PORTS.postgres}`);
    expect(config.SMTP_PORT).toBe(DEMO_PORTS.smtp);
    expect(config.S3_FORCE_PATH_STYLE).toBe(true);
  });

  it('names every variable that is wrong', () => {
    expect(() => parseEnv({ SMTP_PORT: 'twenty-five', STRIPE_SECRET_KEY: 'pk_live_x' })).toThrow(InvalidEnvironment);
    expect(() => parseEnv({ SMTP_PORT: 'twenty-five', STRIPE_SECRET_KEY: 'pk_live_x' })).toThrow(
      /SMTP_PORT[\s\S]*STRIPE_SECRET_KEY: must be a secret key/,
    );
  });

  it('refuses the local secret on a public address', () => {
    expect(() => parseEnv({ NEXTAUTH_URL: 'https://whorlwind.example' })).toThrow(/NEXTAUTH_SECRET/);
    expect(parseEnv({ NEXTAUTH_URL: 'https://whorlwind.example', NEXTAUTH_SECRET: 'x'.repeat(40) }).NEXTAUTH_URL).toBe(
      'https://whorlwind.example',
    );
  });

  it('lets production leave the stand-in endpoints empty', () => {
    const config = parseEnv({ S3_ENDPOINT: '', STRIPE_API_URL: '', MAIL_SINK_URL: '' });
    expect(config.S3_ENDPOINT).toBe('');
    expect(config.STRIPE_API_URL).toBe('');
    expect(config.MAIL_SINK_URL).toBe('');
  });
});
