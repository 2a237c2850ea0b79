import { describe, expect, it } from 'vitest';
import { roles } from '../../shared/protocol/api-types';
import { DEMO_ACCOUNTS } from './seed-demo';

describe('demo accounts', () => {
  it('keep the role out of the name, since every page shows the role beside it', () => {
    for (const account of DEMO_ACCOUNTS) {
      for (const role of roles) expect(account.displayName.toLowerCase()).not.toContain(role);
    }
    expect(new Set(DEMO_ACCOUNTS.map((account) => account.role))).toEqual(new Set(roles));
  });
});
