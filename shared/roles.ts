export const ORGANIZATION_KINDS = ['manufacturer', 'contractor'] as const;
export type OrganizationKind = (typeof ORGANIZATION_KINDS)[number];

export const ROLES = ['installer', 'reviewer', 'accountant', 'administrator'] as const;
export type Role = (typeof ROLES)[number];

export const USER_STATUSES = ['invited', 'active', 'disabled'] as const;
export type UserStatus = (typeof USER_STATUSES)[number];

/** Which roles make sense in which kind of organisation. */
export const ROLES_BY_KIND: Record<OrganizationKind, readonly Role[]> = {
  contractor: ['installer', 'administrator'],
  manufacturer: ['reviewer', 'accountant', 'administrator'],
};

export const ROLE_LABELS: Record<Role, string> = {
  installer: 'Installer',
  reviewer: 'Reviewer',
  accountant: 'Accountant',
  administrator: 'Administrator',
};
