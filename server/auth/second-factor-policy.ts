import type { AppConfig } from '../config/env';

type PolicyUser = {
  roles: readonly string[];
  organization: { kind: string; requireSecondFactor?: boolean };
};

/**
 * Whether this person must have a second factor: everyone in an organisation that requires it, and (unless
 * SECOND_FACTOR_FOR_ROLES is off, as in demo mode) the accountants and administrators of manufacturers, who move
 * money and manage people.
 */
export function secondFactorRequired(config: Pick<AppConfig, 'secondFactorForRoles'>, user: PolicyUser) {
  if (user.organization.requireSecondFactor) return true;
  return (
    config.secondFactorForRoles &&
    user.organization.kind === 'manufacturer' &&
    (user.roles.includes('accountant') || user.roles.includes('administrator'))
  );
}
