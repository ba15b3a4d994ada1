import { describe, expect, it } from 'vitest';
import { defineAbilityFor } from '../../shared/abilities';
import type { OrganizationKind, Role } from '../../shared/roles';
import { navFor } from '../../src/config/nav';

const user = (roles: Role[], kind: OrganizationKind) => ({ id: 'u1', roles, organization: { id: 'o1', kind } });

describe('navigation by role', () => {
  it('shows each role only what it may do', () => {
    const labels = (roles: Role[], kind: OrganizationKind, demoMode = true) =>
      navFor(defineAbilityFor(user(roles, kind), { demoMode })).map((i) => i.label);
    expect(labels(['installer'], 'contractor')).toEqual(['Home', 'Catalogue', 'Sites', 'Credits']);
    expect(labels(['reviewer'], 'manufacturer')).toEqual(['Home', 'Catalogue', 'Sites']);
    expect(labels(['accountant'], 'manufacturer')).toEqual(['Home', 'Catalogue', 'Sites', 'Credits']);
    expect(labels(['administrator'], 'contractor')).toEqual(['Home', 'Catalogue', 'Sites', 'Credits', 'People', 'Mailbox']);
    expect(labels(['administrator'], 'manufacturer', false)).toEqual(['Home', 'Catalogue', 'Sites', 'People']);
  });
});
