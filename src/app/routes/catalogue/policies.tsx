import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Plus, ShieldCheck } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeader } from '../../../components/ui/page-header';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { policyQueries } from '../../../features/catalogue/api/policy-queries';
import { PolicyTermsDialog } from '../../../features/catalogue/components/policy-terms-dialog';
import { useAbility } from '../../../lib/ability';
import { CatalogueTabs } from './catalogue-tabs';

export function PoliciesRoute() {
  const ability = useAbility();
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [creating, setCreating] = useState(false);
  const list = useQuery(policyQueries.list({ page, q: q || undefined }));
  const canCreate = ability.can('create', 'WarrantyPolicy');
  return (
    <>
      <PageHeader
        title="Catalogue"
        description="Warranty policies and their versions."
        actions={canCreate ? <Button icon={<Plus className="size-4" aria-hidden />} onClick={() => setCreating(true)}>New policy</Button> : null}
      />
      <CatalogueTabs />
      <Card>
        <div className="border-b border-ink-100 p-3 sm:p-4">
          <label htmlFor="policy-search" className="mb-1.5 block text-sm font-medium text-ink-800">
            Search
          </label>
          <input
            id="policy-search"
            type="search"
            placeholder="Policy name"
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              setPage(1);
            }}
            className="h-11 w-full rounded-lg border border-ink-300 px-3 text-base sm:max-w-xs sm:text-sm"
          />
        </div>
        {list.isPending ? (
          <div className="p-8 text-center">
            <Spinner label="Loading policies" />
          </div>
        ) : list.data && list.data.items.length === 0 ? (
          <EmptyState icon={<ShieldCheck className="size-6" />} title="No policies match" />
        ) : list.data ? (
          <>
            <Table caption="Warranty policies">
              <thead>
                <tr>
                  <Th>Policy</Th>
                  <Th>Manufacturer</Th>
                  <Th>Current terms</Th>
                  <Th>Models</Th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {list.data.items.map((p) => (
                  <tr key={p.id}>
                    <Td>
                      <Link to={`/policies/${p.id}`} className="inline-flex min-h-11 items-center font-medium text-brand-800 hover:underline">
                        {p.name}
                      </Link>
                    </Td>
                    <Td className="whitespace-nowrap">{p.manufacturer.name}</Td>
                    <Td className="whitespace-nowrap">
                      {p.latestVersion
                        ? `v${p.latestVersion.versionNumber}: ${p.latestVersion.termMonths} months, ${p.latestVersion.unitCredit} ${p.latestVersion.currency}`
                        : '—'}
                    </Td>
                    <Td>{p.models.map((m) => m.modelNumber).join(', ')}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
            <Pagination page={list.data.page} pageSize={list.data.pageSize} total={list.data.total} onPage={setPage} />
          </>
        ) : (
          <p role="alert" className="p-6 text-sm text-bad-800">
            Could not load policies.
          </p>
        )}
      </Card>
      {creating ? <PolicyTermsDialog open onClose={() => setCreating(false)} /> : null}
    </>
  );
}
