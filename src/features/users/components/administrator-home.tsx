import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import { ShieldCheck, Users } from 'lucide-react';
import { buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { PageHeader } from '../../../components/ui/page-header';
import { userQueries } from '../api/user-queries';
import { DateSettings } from './date-settings';

/** An administrator's home: the people of the organisation and its settings. */
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
