import { useQuery } from '@tanstack/react-query';
import { ShieldAlert } from 'lucide-react';
import {
  SECURITY_EVENT_ACTIONS,
  SECURITY_EVENT_LABELS,
  type SecurityEventDto,
} from '../../../../shared/schemas/security';
import {
  DataTable,
  FilterSelect,
  TableToolbar,
  useListState,
  type Column,
} from '../../../components/ui/data-table';
import { PageHeader } from '../../../components/ui/page-header';
import { useSession } from '../../../lib/ability';
import { securityQueries } from '../api/security-api';

const columns: Column<SecurityEventDto>[] = [
  {
    key: 'when',
    header: 'When',
    className: 'whitespace-nowrap',
    cell: (e) =>
      new Date(e.occurredAt).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'medium' }),
  },
  { key: 'kind', header: 'Event', cell: (e) => SECURITY_EVENT_LABELS[e.action] ?? e.action },
  {
    key: 'person',
    header: 'Person',
    cell: (e) =>
      e.subject ? (
        <>
          <p className="font-medium text-ink-950">{e.subject.name}</p>
          <p className="text-xs text-ink-600">{e.subject.email}</p>
        </>
      ) : (
        <span className="text-ink-600">The organisation</span>
      ),
  },
  { key: 'by', header: 'By', cell: (e) => e.actor?.name ?? '' },
  { key: 'ip', header: 'Address', className: 'font-mono text-xs', cell: (e) => e.ip ?? '' },
];

/** For administrators: the organisation's sign-ins, failures, lockouts, resets, factor and role changes. */
export function SecurityEvents() {
  const { user } = useSession();
  const { values, params, set, tableProps } = useListState({ userId: '', action: '' });
  const events = useQuery(securityQueries.events(params));
  const people = useQuery(securityQueries.people());
  const peopleIds = (people.data?.items ?? []).map((p) => p.id);
  const nameOf = (id: string) => people.data?.items.find((p) => p.id === id)?.name ?? id;
  return (
    <>
      <PageHeader
        title="Security events"
        description={`Sign-ins, failures, lockouts, password and second-factor changes and role changes at ${user.organization.name}, newest first.`}
      />
      <DataTable
        caption="Security events"
        columns={columns}
        result={events}
        loadingLabel="Loading security events"
        errorText="Could not load the security events."
        empty={{ icon: <ShieldAlert className="size-8" aria-hidden />, title: 'No security events match.' }}
        onPage={tableProps.onPage}
        toolbar={
          <TableToolbar className="grid gap-3 sm:grid-cols-2">
            <FilterSelect
              label="Person"
              anyLabel="Everyone"
              values={peopleIds}
              labelOf={nameOf}
              value={values.userId}
              onChange={(userId) => set({ userId })}
            />
            <FilterSelect
              label="Kind of event"
              anyLabel="Every kind"
              values={SECURITY_EVENT_ACTIONS}
              labelOf={(a) => SECURITY_EVENT_LABELS[a]}
              value={values.action}
              onChange={(action) => set({ action })}
            />
          </TableToolbar>
        }
      />
    </>
  );
}
