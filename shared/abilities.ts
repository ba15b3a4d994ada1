import { AbilityBuilder, createMongoAbility, type MongoAbility } from '@casl/ability';
import type { OrganizationKind, Role } from './roles';

// Who may do what, defined once for the server (which checks after loading each record) and the client
// (which only hides what a user cannot do). Deny by default; every rule is scoped to the user's organisation
// or to the records that tie the two organisations of a claim.

export type Action =
  | 'manage'
  | 'read'
  | 'create'
  | 'update'
  | 'delete'
  | 'invite'
  | 'disable'
  | 'file'
  | 'review'
  | 'decide'
  | 'credit'
  | 'export';

export type SubjectName =
  | 'Organization'
  | 'User'
  | 'ProductModel'
  | 'WarrantyPolicy'
  | 'Installation'
  | 'Claim'
  | 'CreditMemo'
  | 'AccountingMap'
  | 'AuditEvent'
  | 'Mailbox'
  | 'Evaluation'
  | 'Analytics'
  | 'Reserve'
  | 'ApiToken'
  | 'Webhook'
  | 'SavedView'
  | 'Waiting'
  | 'Ageing'
  | 'all';

export type AbilityUser = {
  id: string;
  roles: readonly Role[];
  organization: { id: string; kind: OrganizationKind };
};

export type AppAbility = MongoAbility<[Action, SubjectName | Record<string, unknown>]>;

export function defineAbilityFor(
  user: AbilityUser | null,
  opts: { demoMode?: boolean; viaApiToken?: boolean } = {},
): AppAbility {
  const { can, cannot, build } = new AbilityBuilder<AppAbility>(createMongoAbility);
  if (!user) return build();

  const orgId = user.organization.id;
  const kind = user.organization.kind;
  const has = (role: Role) => user.roles.includes(role);

  // Everyone signed in: their own organisation and profile, the engine, and the public catalogues.
  can('read', 'Organization', { id: orgId });
  can('read', 'User', { id: user.id });
  can('read', 'Evaluation');
  can('create', 'Evaluation');
  can('read', 'ProductModel');
  can('read', 'WarrantyPolicy');
  // What waits on them: their own list, and marking its items read.
  can(['read', 'update'], 'Waiting');

  if (has('administrator')) {
    // Their organisation's settings (the time zone and locale its dates are shown in).
    can('update', 'Organization', { id: orgId });
    can('read', 'User', { organizationId: orgId });
    can(['invite', 'update', 'disable'], 'User', { organizationId: orgId });
    cannot(['disable'], 'User', { id: user.id }); // an administrator cannot lock themself out
    can('read', 'AuditEvent', { organizationId: orgId });
    // Its security settings (a second factor for every member).
    can('update', 'Organization', { id: orgId });
    if (opts.demoMode) can('read', 'Mailbox');
    // Integrations: only a signed-in administrator, never a token (a token cannot mint or widen tokens).
    if (!opts.viaApiToken) {
      can(['read', 'create', 'delete'], 'ApiToken', { organizationId: orgId });
      can(['read', 'create', 'update', 'delete'], 'Webhook', { organizationId: orgId });
    }
    if (kind === 'manufacturer') {
      // Its settings: the amount above which a credit needs a second accountant.
      can('update', 'Organization', { id: orgId });
      // The ageing of their open claims, and the target days per stage it is judged against.
      can(['read', 'update'], 'Ageing', { manufacturerId: orgId });
      can(['create', 'update'], 'ProductModel', { manufacturerId: orgId });
      can(['create', 'update'], 'WarrantyPolicy', { manufacturerId: orgId });
    }
  }

  if (kind === 'contractor') {
    can('read', 'Installation', { contractorId: orgId });
    can('read', 'Claim', { contractorId: orgId });
    can('read', 'CreditMemo', { contractorId: orgId });
    if (has('installer') || has('administrator')) {
      can(['create', 'update'], 'Installation', { contractorId: orgId });
      can(['create', 'update', 'file', 'delete'], 'Claim', { contractorId: orgId });
    }
  }

  if (kind === 'manufacturer') {
    can('read', 'Installation', { manufacturerId: orgId });
    can('read', 'Claim', { manufacturerId: orgId, stage: { $ne: 'draft' } });
    if (has('reviewer')) can(['review', 'decide'], 'Claim', { manufacturerId: orgId });
    // The review desk's saved filters: each reviewer's own.
    if (has('reviewer')) can(['read', 'create', 'delete'], 'SavedView', { userId: user.id });
    // Failure analysis is the reviewers' (and their administrator's); the reserve is the accountants'. Both read
    // only their own manufacturer's record: the server scopes every query to manufacturerId.
    if (has('reviewer') || has('administrator')) can('read', 'Analytics', { manufacturerId: orgId });
    // The names of the contractors who file with them (the queue's picker); the server lists only those with
    // claims on this manufacturer.
    if (has('reviewer') || has('administrator')) can('read', 'Organization', { kind: 'contractor' });
    if (has('accountant') || has('administrator')) {
      can(['read', 'export'], 'Reserve', { manufacturerId: orgId });
      // The accounts the journal export books credit memos to: set once by the organisation's money people.
      can(['read', 'update'], 'AccountingMap', { organizationId: orgId });
    }
    if (has('accountant')) {
      can('credit', 'Claim', { manufacturerId: orgId });
      can(['read', 'create', 'export'], 'CreditMemo', { manufacturerId: orgId });
    }
  }

  return build();
}
