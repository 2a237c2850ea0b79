import { describe, expect, it } from 'vitest';
import { servingRoleRefusal, type ServingRoleFacts } from './app-role-check';

const leastPrivilege: ServingRoleFacts = {
  role: 'kinetwin_app',
  superuser: false,
  createRole: false,
  createDatabase: false,
  bypassRowSecurity: false,
  ownsDatabase: false,
  ownedSchemas: [],
  ownedRelations: [],
  mayCreate: false,
};

describe('the serving role check', () => {
  it('accepts a role that owns nothing and holds only grants', () => {
    expect(servingRoleRefusal(leastPrivilege)).toBeNull();
  });

  it('refuses a superuser in one line that names the role and both ways out', () => {
    const refusal = servingRoleRefusal({ ...leastPrivilege, role: 'kinetwin', superuser: true, ownsDatabase: true, mayCreate: true });
    expect(refusal).toMatch(/^the database role kinetwin \(DATABASE_URL\) is a superuser, owns the database:/);
    expect(refusal).toMatch(/DATABASE_OWNER_URL/);
    expect(refusal).toMatch(/ALLOW_PRIVILEGED_DATABASE_ROLE=true/);
    expect(refusal).not.toMatch(/\n/);
  });

  it('refuses an owner of tables, listing three and counting the rest', () => {
    const ownedRelations = ['public.activity', 'public.comments', 'public.handoffs', 'public.outbox', 'public.users'];
    expect(servingRoleRefusal({ ...leastPrivilege, ownedRelations, ownedSchemas: ['drizzle'] })).toMatch(
      /owns the schema drizzle, owns 5 tables \(public\.activity, public\.comments, public\.handoffs and 2 more\)/,
    );
  });

  it('refuses a role that may create roles, databases or tables, or bypasses row security', () => {
    expect(servingRoleRefusal({ ...leastPrivilege, createRole: true })).toMatch(/may create roles/);
    expect(servingRoleRefusal({ ...leastPrivilege, createDatabase: true })).toMatch(/may create databases/);
    expect(servingRoleRefusal({ ...leastPrivilege, mayCreate: true })).toMatch(/may create schemas or tables/);
    expect(servingRoleRefusal({ ...leastPrivilege, bypassRowSecurity: true })).toMatch(/bypasses row security/);
  });
});
