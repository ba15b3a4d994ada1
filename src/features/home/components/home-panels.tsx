import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import { HardHat, ShieldCheck, Users } from 'lucide-react';
import type { ReactNode } from 'react';
import { buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeader } from '../../../components/ui/page-header';
import { userQueries } from '../../users/api/user-queries';
import { DateSettings } from '../../users/components/date-settings';

function Step({ n, title, children }: { n: number; title: string; children: ReactNode }) {
  return (
    <li className="flex gap-3">
      <span
        aria-hidden
        className="grid size-7 shrink-0 place-items-center rounded-full bg-brand-100 text-sm font-bold text-brand-800"
      >
        {n}
      </span>
      <div>
        <p className="font-medium text-ink-900">{title}</p>
        <p className="text-sm text-ink-600">{children}</p>
      </div>
    </li>
  );
}

export function InstallerHome({
  name,
  organization,
  openClaims,
}: {
  name: string;
  organization: string;
  openClaims?: ReactNode;
}) {
  return (
    <>
      <PageHeader title="Field claims" description={`${organization} · signed in as ${name}`} />
      <div className="grid gap-4 lg:grid-cols-3">
        <Card className="lg:col-span-2">
          <CardHeader
            title="Your open claims"
            description="Claims your company has filed and what each one is waiting for."
            actions={
              <Link to="/claims/new" className={buttonClasses('primary', 'sm')}>
                New claim
              </Link>
            }
          />
          {openClaims ?? (
            <EmptyState icon={<HardHat className="size-6" />} title="No open claims">
              When a fixture fails on site, file a claim from its installation with readings and photos; it
              shows up here with what the manufacturer asks of you.
            </EmptyState>
          )}
        </Card>
        <Card>
          <CardHeader title="Before you measure" />
          <ul className="space-y-4 px-4 py-4 sm:px-5">
            <Step n={1} title="Qualified persons only">
              Live readings follow NFPA 70E and your employer&apos;s procedures, with suitable PPE and a meter
              rated CAT III or IV.
            </Step>
            <Step n={2} title="De-energise when you can">
              Lock out whenever possible. LED driver outputs can exceed 50 V DC.
            </Step>
            <Step n={3} title="Photos that decide claims">
              The nameplate, the failure and the site: most manufacturers ask for at least two.
            </Step>
          </ul>
        </Card>
      </div>
    </>
  );
}

export function AdministratorHome({ name, organization }: { name: string; organization: string }) {
  const people = useQuery(userQueries.list({ page: 1 }));
  const active = people.data?.items.filter((u) => u.status === 'active').length;
  return (
    <>
      <PageHeader title="Organisation settings" description={`${organization} · signed in as ${name}`} />
      <div className="grid gap-4 md:grid-cols-2">
        <Card>
          <CardHeader
            title="People"
            description="Invite colleagues, give them roles, and disable accounts that should no longer sign in."
            actions={
              <Link to="/admin/users" className={buttonClasses('primary', 'sm')}>
                <Users className="size-4" aria-hidden /> Manage people
              </Link>
            }
          />
          <dl className="grid grid-cols-2 gap-4 px-5 py-4">
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Accounts</dt>
              <dd className="text-2xl font-bold text-ink-950">{people.data?.total ?? '–'}</dd>
            </div>
            <div>
              <dt className="text-xs font-medium text-ink-600 uppercase">Active on this page</dt>
              <dd className="text-2xl font-bold text-ink-950">{active ?? '–'}</dd>
            </div>
          </dl>
        </Card>
        <Card>
          <CardHeader title="Access is per organisation" />
          <p className="flex gap-3 px-5 py-4 text-sm text-ink-700">
            <ShieldCheck className="size-5 shrink-0 text-brand-700" aria-hidden />
            People you invite see only your organisation&apos;s records, and the claims that tie you to the
            other party.
          </p>
        </Card>
        <DateSettings />
      </div>
    </>
  );
}
