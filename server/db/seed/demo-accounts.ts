import type { OrganizationKind, Role } from '../../../shared/roles';

// The fictional scenario's organisations and people (API.md). Every account's password is DEMO_PASSWORD.
export const DEMO_PASSWORD = 'lumenproof-demo';

// Each in its own zone, so the demo shows times moved into the reader's organisation's zone (shared/dates.ts).
export const DEMO_ORGANIZATIONS: {
  key: string;
  name: string;
  kind: OrganizationKind;
  timeZone: string;
  locale: string;
}[] = [
  {
    key: 'harborview',
    name: 'Harborview Electric',
    kind: 'contractor',
    timeZone: 'America/Los_Angeles',
    locale: 'en-US',
  },
  {
    key: 'copperline',
    name: 'Copperline Electrical',
    kind: 'contractor',
    timeZone: 'America/Boise',
    locale: 'en-US',
  },
  {
    key: 'aldercrest',
    name: 'Aldercrest Lighting',
    kind: 'manufacturer',
    timeZone: 'America/Chicago',
    locale: 'en-US',
  },
  {
    key: 'veltra',
    name: 'Veltra Luminaires',
    kind: 'manufacturer',
    timeZone: 'America/Toronto',
    locale: 'en-CA',
  },
];

export const DEMO_ACCOUNTS: { email: string; name: string; roles: Role[]; org: string }[] = [
  { email: 'ines@harborview.test', name: 'Ines Morrow', roles: ['installer'], org: 'harborview' },
  { email: 'hana@harborview.test', name: 'Hana Okafor', roles: ['administrator'], org: 'harborview' },
  { email: 'omar@copperline.test', name: 'Omar Lindqvist', roles: ['installer'], org: 'copperline' },
  { email: 'rhea@aldercrest.test', name: 'Rhea Castellano', roles: ['reviewer'], org: 'aldercrest' },
  // Rhea's colleague on the warranty desk: someone to hand a claim to.
  { email: 'sunniva@aldercrest.test', name: 'Sunniva Pell', roles: ['reviewer'], org: 'aldercrest' },
  { email: 'ada@aldercrest.test', name: 'Ada Brennock', roles: ['accountant'], org: 'aldercrest' },
  { email: 'max@aldercrest.test', name: 'Max Oduya', roles: ['administrator'], org: 'aldercrest' },
  { email: 'theo@veltra.test', name: 'Theo Varga', roles: ['reviewer'], org: 'veltra' },
  { email: 'vera@veltra.test', name: 'Vera Sunquist', roles: ['accountant'], org: 'veltra' },
];
