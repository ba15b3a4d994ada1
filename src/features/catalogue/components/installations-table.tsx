import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { MapPin } from 'lucide-react';
import { ENCLOSURE_LABELS, ENCLOSURES, LOCATION_LABELS, LOCATIONS, NOMINAL_SUPPLY_VOLTS } from '../../../../shared/schemas/catalogue';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { ApiError } from '../../../lib/api-client';
import { useSession } from '../../../lib/ability';
import { installationQueries } from '../api/installation-queries';

const SORTS = [
  ['-installDate', 'Installed, newest first'],
  ['installDate', 'Installed, oldest first'],
  ['siteName', 'Site name'],
  ['-quantity', 'Quantity, largest first'],
  ['-createdAt', 'Registered, newest first'],
] as const;

export function InstallationsTable() {
  const { user } = useSession();
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [location, setLocation] = useState('');
  const [enclosure, setEnclosure] = useState('');
  const [supply, setSupply] = useState('');
  const [sort, setSort] = useState('-installDate');
  const list = useQuery(
    installationQueries.list({ page, q: q || undefined, location: location || undefined, enclosure: enclosure || undefined, nominalSupplyVolts: supply || undefined, sort }),
  );
  const reset = (set: (v: string) => void) => (v: string) => {
    set(v);
    setPage(1);
  };
  const other = user.organization.kind === 'contractor' ? 'manufacturer' : 'contractor';

  return (
    <Card>
      <div className="grid gap-3 border-b border-ink-100 p-3 sm:grid-cols-2 sm:p-4 lg:grid-cols-5">
        <div className="space-y-1.5 sm:col-span-2 lg:col-span-1">
          <label htmlFor="installation-search" className="block text-sm font-medium text-ink-800">
            Search
          </label>
          <input
            id="installation-search"
            type="search"
            placeholder="Site, city, invoice, serial or model"
            value={q}
            onChange={(e) => reset(setQ)(e.target.value)}
            className="h-11 w-full rounded-lg border border-ink-300 px-3 text-base sm:text-sm"
          />
        </div>
        <SelectField label="Location" value={location} onChange={(e) => reset(setLocation)(e.target.value)}>
          <option value="">Any</option>
          {LOCATIONS.map((l) => (
            <option key={l} value={l}>
              {LOCATION_LABELS[l]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Enclosure" value={enclosure} onChange={(e) => reset(setEnclosure)(e.target.value)}>
          <option value="">Any</option>
          {ENCLOSURES.map((x) => (
            <option key={x} value={x}>
              {ENCLOSURE_LABELS[x]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Nominal supply (V)" value={supply} onChange={(e) => reset(setSupply)(e.target.value)}>
          <option value="">Any</option>
          {NOMINAL_SUPPLY_VOLTS.map((v) => (
            <option key={v} value={v}>
              {v} V
            </option>
          ))}
        </SelectField>
        <SelectField label="Sort by" value={sort} onChange={(e) => reset(setSort)(e.target.value)}>
          {SORTS.map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </SelectField>
      </div>
      {list.isPending ? (
        <div className="p-8 text-center">
          <Spinner label="Loading installations" />
        </div>
      ) : list.data && list.data.items.length === 0 ? (
        <EmptyState icon={<MapPin className="size-6" />} title="No installations match">
          Try another search or fewer filters.
        </EmptyState>
      ) : list.data ? (
        <>
          <Table caption="Installations">
            <thead>
              <tr>
                <Th>Site</Th>
                <Th>Product</Th>
                <Th>{other === 'manufacturer' ? 'Manufacturer' : 'Contractor'}</Th>
                <Th className="text-right">Units</Th>
                <Th>Installed</Th>
                <Th>Conditions</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {list.data.items.map((i) => (
                <tr key={i.id}>
                  <Td>
                    <Link to={`/installations/${i.id}`} className="inline-flex min-h-11 flex-col justify-center font-medium text-brand-800 hover:underline">
                      {i.siteName}
                      <span className="text-xs font-normal text-ink-600">
                        {i.siteCity}, {i.siteRegion}
                      </span>
                    </Link>
                  </Td>
                  <Td className="whitespace-nowrap">{i.product.modelNumber}</Td>
                  <Td className="whitespace-nowrap">{other === 'manufacturer' ? i.manufacturer.name : i.contractor.name}</Td>
                  <Td className="text-right tabular-nums">{i.quantity}</Td>
                  <Td className="whitespace-nowrap tabular-nums">{i.installDate}</Td>
                  <Td className="text-xs whitespace-nowrap text-ink-700">
                    {LOCATION_LABELS[i.location]} · {ENCLOSURE_LABELS[i.enclosure]} · {i.nominalSupplyVolts} V
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <Pagination page={list.data.page} pageSize={list.data.pageSize} total={list.data.total} onPage={setPage} />
        </>
      ) : (
        <p role="alert" className="p-6 text-sm text-bad-800">
          {list.error instanceof ApiError ? list.error.message : 'Could not load installations.'}
        </p>
      )}
    </Card>
  );
}
