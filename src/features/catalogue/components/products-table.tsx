import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Lightbulb } from 'lucide-react';
import { DIMMING_LABELS, DIMMINGS, FAMILY_LABELS, LOCATION_LABELS, LOCATIONS, PRODUCT_FAMILIES } from '../../../../shared/schemas/catalogue';
import { Badge } from '../../../components/ui/badge';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { SelectField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { Pagination, Table, Td, Th } from '../../../components/ui/table';
import { ApiError } from '../../../lib/api-client';
import { productQueries } from '../api/product-queries';
import { n } from './format';

const SORT_OPTIONS = [
  ['modelNumber', 'Model number'],
  ['name', 'Name'],
  ['family', 'Family'],
  ['-ratedInputWatts', 'Power, highest first'],
  ['ratedInputWatts', 'Power, lowest first'],
  ['-ratedLumens', 'Light output, highest first'],
  ['-createdAt', 'Newest first'],
] as const;

/** The product catalogues: search, filters and sort run on the server. */
export function ProductsTable() {
  const [page, setPage] = useState(1);
  const [q, setQ] = useState('');
  const [family, setFamily] = useState('');
  const [location, setLocation] = useState('');
  const [dimming, setDimming] = useState('');
  const [sort, setSort] = useState('modelNumber');
  const list = useQuery(productQueries.list({ page, q: q || undefined, family: family || undefined, location: location || undefined, dimming: dimming || undefined, sort }));
  const reset = <T,>(set: (v: T) => void) => (v: T) => {
    set(v);
    setPage(1);
  };

  return (
    <Card>
      <div className="grid gap-3 border-b border-ink-100 p-3 sm:grid-cols-2 sm:p-4 lg:grid-cols-5">
        <div className="space-y-1.5 sm:col-span-2 lg:col-span-1">
          <label htmlFor="product-search" className="block text-sm font-medium text-ink-800">
            Search
          </label>
          <input
            id="product-search"
            type="search"
            placeholder="Model number or name"
            value={q}
            onChange={(e) => reset(setQ)(e.target.value)}
            className="h-11 w-full rounded-lg border border-ink-300 px-3 text-base sm:text-sm"
          />
        </div>
        <SelectField label="Family" value={family} onChange={(e) => reset(setFamily)(e.target.value)}>
          <option value="">All families</option>
          {PRODUCT_FAMILIES.map((f) => (
            <option key={f} value={f}>
              {FAMILY_LABELS[f]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Location rating" value={location} onChange={(e) => reset(setLocation)(e.target.value)}>
          <option value="">Any</option>
          {LOCATIONS.map((l) => (
            <option key={l} value={l}>
              {LOCATION_LABELS[l]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Dimming" value={dimming} onChange={(e) => reset(setDimming)(e.target.value)}>
          <option value="">Any</option>
          {DIMMINGS.map((d) => (
            <option key={d} value={d}>
              {DIMMING_LABELS[d]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Sort by" value={sort} onChange={(e) => reset(setSort)(e.target.value)}>
          {SORT_OPTIONS.map(([v, l]) => (
            <option key={v} value={v}>
              {l}
            </option>
          ))}
        </SelectField>
      </div>
      {list.isPending ? (
        <div className="p-8 text-center">
          <Spinner label="Loading the catalogue" />
        </div>
      ) : list.data && list.data.items.length === 0 ? (
        <EmptyState icon={<Lightbulb className="size-6" />} title="No models match">
          Try another search or fewer filters.
        </EmptyState>
      ) : list.data ? (
        <>
          <Table caption="Product models">
            <thead>
              <tr>
                <Th>Model</Th>
                <Th>Manufacturer</Th>
                <Th>Family</Th>
                <Th className="text-right">Power (W)</Th>
                <Th className="text-right">Output (lm)</Th>
                <Th>Ratings</Th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {list.data.items.map((p) => (
                <tr key={p.id}>
                  <Td>
                    <Link to={`/catalogue/${p.id}`} className="inline-flex min-h-11 flex-col justify-center font-medium text-brand-800 underline-offset-2 hover:underline">
                      {p.modelNumber}
                      <span className="text-xs font-normal text-ink-600">{p.name}</span>
                    </Link>
                  </Td>
                  <Td className="whitespace-nowrap">{p.manufacturer.name}</Td>
                  <Td className="whitespace-nowrap">{FAMILY_LABELS[p.family]}</Td>
                  <Td className="text-right tabular-nums">{n(p.ratedInputWatts)}</Td>
                  <Td className="text-right tabular-nums">{n(p.ratedLumens, 0)}</Td>
                  <Td>
                    <div className="flex flex-wrap gap-1">
                      <Badge tone={p.location === 'wet' ? 'info' : p.location === 'damp' ? 'brand' : 'neutral'}>{LOCATION_LABELS[p.location]}</Badge>
                      {p.enclosedRated ? <Badge tone="ok">Enclosed-rated</Badge> : null}
                      <Badge>{DIMMING_LABELS[p.dimming]}</Badge>
                    </div>
                  </Td>
                </tr>
              ))}
            </tbody>
          </Table>
          <Pagination page={list.data.page} pageSize={list.data.pageSize} total={list.data.total} onPage={setPage} />
        </>
      ) : (
        <p role="alert" className="p-6 text-sm text-bad-800">
          {list.error instanceof ApiError ? list.error.message : 'Could not load the catalogue.'}
        </p>
      )}
    </Card>
  );
}
