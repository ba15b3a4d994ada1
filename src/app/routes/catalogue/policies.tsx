import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router';
import { Plus, ShieldCheck } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import type { PolicyDto } from '../../../../shared/schemas/catalogue';
import {
  DataTable,
  SearchField,
  TableToolbar,
  useListState,
  type Column,
} from '../../../components/ui/data-table';
import { PageHeader } from '../../../components/ui/page-header';
import { policyQueries } from '../../../features/catalogue/api/policy-queries';
import { PolicyTermsDialog } from '../../../features/catalogue/components/policy-terms-dialog';
import { useAbility } from '../../../lib/ability';
import { CatalogueTabs } from './catalogue-tabs';

const COLUMNS: Column<PolicyDto>[] = [
  {
    key: 'policy',
    header: 'Policy',
    sortKey: 'name',
    cell: (p) => (
      <Link
        to={`/policies/${p.id}`}
        className="inline-flex min-h-11 items-center font-medium text-brand-800 hover:underline"
      >
        {p.name}
      </Link>
    ),
  },
  {
    key: 'manufacturer',
    header: 'Manufacturer',
    className: 'whitespace-nowrap',
    cell: (p) => p.manufacturer.name,
  },
  {
    key: 'terms',
    header: 'Current terms',
    className: 'whitespace-nowrap',
    cell: (p) =>
      p.latestVersion
        ? `v${p.latestVersion.versionNumber}: ${p.latestVersion.termMonths} months, ${p.latestVersion.unitCredit} ${p.latestVersion.currency}`
        : '—',
  },
  { key: 'models', header: 'Models', cell: (p) => p.models.map((m) => m.modelNumber).join(', ') },
];

export function PoliciesRoute() {
  const ability = useAbility();
  const { values, params, set, tableProps } = useListState({ q: '', sort: 'name' });
  const [creating, setCreating] = useState(false);
  const list = useQuery(policyQueries.list(params));
  const canCreate = ability.can('create', 'WarrantyPolicy');
  return (
    <>
      <PageHeader
        title="Catalogue"
        description="Warranty policies and their versions."
        actions={
          canCreate ? (
            <Button icon={<Plus className="size-4" aria-hidden />} onClick={() => setCreating(true)}>
              New policy
            </Button>
          ) : null
        }
      />
      <CatalogueTabs />
      <DataTable
        caption="Warranty policies"
        columns={COLUMNS}
        result={list}
        loadingLabel="Loading policies"
        empty={{ icon: <ShieldCheck className="size-6" />, title: 'No policies match' }}
        errorText="Could not load policies."
        {...tableProps}
        toolbar={
          <TableToolbar>
            <SearchField
              label="Search"
              placeholder="Policy name"
              value={values.q}
              onChange={(q) => set({ q })}
              className="sm:max-w-xs"
            />
          </TableToolbar>
        }
      />
      {creating ? <PolicyTermsDialog open onClose={() => setCreating(false)} /> : null}
    </>
  );
}
