// The README promises these accounts; the seed creates them from db/demo-scenario.ts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEMO_ACCOUNTS } from '@/db/demo-scenario';

describe('demo accounts in the README', () => {
  const readme = readFileSync(new URL('../../../README.md', import.meta.url), 'utf8');

  it.each(DEMO_ACCOUNTS)('lists $email with its password and role', (account) => {
    const row = readme.split('\n').find((line) => line.includes(`\`${account.email}\``));
    expect(row).toBeDefined();
    expect(row).toContain(`\`${account.password}\``);
    for (const role of account.roles) expect(row).toContain(role);
  });
});
