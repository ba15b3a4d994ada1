import { describe, expect, it } from 'vitest';
import { defineAbilityFor } from '../../shared/abilities';
import type { OrganizationKind, Role } from '../../shared/roles';
import { navFor } from '../../src/config/nav';

const user = (roles: Role[], kind: OrganizationKind) => ({
  id: 'u1',
  roles,
  organization: { id: 'o1', kind },
});

describe('navigation by role', () => {
  it('shows each role only what it may do', () => {
    const labels = (roles: Role[], kind: OrganizationKind, demoMode = true) =>
      navFor(defineAbilityFor(user(roles, kind), { demoMode })).map((i) => i.label);
    // Everyone browses the catalogue; installations ("Sites") are scoped to one's own organisation.
    // Claims for everyone who reads claims; Credits for contractors (their own) and accountants.
    expect(labels(['installer'], 'contractor')).toEqual(['Home', 'Claims', 'Catalogue', 'Sites', 'Credits']);
    expect(labels(['reviewer'], 'manufacturer')).toEqual([
      'Home',
      'Claims',
      'Catalogue',
      'Sites',
      'Review desk',
      'Failure analysis',
    ]);
    expect(labels(['accountant'], 'manufacturer')).toEqual([
      'Home',
      'Claims',
      'Catalogue',
      'Sites',
      'Credits',
      'Reserve',
    ]);
    expect(labels(['administrator'], 'contractor')).toEqual([
      'Home',
      'Claims',
      'Catalogue',
      'Sites',
      'Credits',
      'People',
      'Security events',
      'Integrations',
      'Mailbox',
    ]);
    expect(labels(['administrator'], 'manufacturer', false)).toEqual([
      'Home',
      'Claims',
      'Catalogue',
      'Sites',
      'Failure analysis',
      'Reserve',
      'Ageing',
      'People',
      'Security events',
      'Integrations',
    ]);
  });
});
