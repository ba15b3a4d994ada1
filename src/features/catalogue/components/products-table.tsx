import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import { Lightbulb } from 'lucide-react';
import {
  DIMMING_LABELS,
  DIMMINGS,
  FAMILY_LABELS,
  LOCATION_LABELS,
  LOCATIONS,
  PRODUCT_FAMILIES,
  type ProductDto,
} from '../../../../shared/schemas/catalogue';
import { Badge } from '../../../components/ui/badge';
import {
  DataTable,
  FilterSelect,
  SearchField,
  SortSelect,
  TableToolbar,
  useListState,
  type Column,
} from '../../../components/ui/data-table';
import { productQueries } from '../api/product-queries';
import { n } from './format';

const SORT_OPTIONS = [
  ['modelNumber', 'Model number'],
  ['-modelNumber', 'Model number, Z to A'],
  ['name', 'Name'],
  ['family', 'Family'],
  ['-family', 'Family, Z to A'],
  ['-ratedInputWatts', 'Power, highest first'],
  ['ratedInputWatts', 'Power, lowest first'],
  ['-ratedLumens', 'Light output, highest first'],
  ['ratedLumens', 'Light output, lowest first'],
  ['-createdAt', 'Newest first'],
] as const;

const COLUMNS: Column<ProductDto>[] = [
  {
    key: 'model',
    header: 'Model',
    sortKey: 'modelNumber',
    cell: (p) => (
      <Link
        to={`/catalogue/${p.id}`}
        className="inline-flex min-h-11 flex-col justify-center font-medium text-brand-800 underline-offset-2 hover:underline"
      >
        {p.modelNumber}
        <span className="text-xs font-normal text-ink-600">{p.name}</span>
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
    key: 'family',
    header: 'Family',
    sortKey: 'family',
    className: 'whitespace-nowrap',
    cell: (p) => FAMILY_LABELS[p.family],
  },
  {
    key: 'power',
    header: 'Power (W)',
    sortKey: 'ratedInputWatts',
    firstSort: 'descending',
    className: 'text-right tabular-nums',
    headerClassName: 'text-right',
    cell: (p) => n(p.ratedInputWatts),
  },
  {
    key: 'output',
    header: 'Output (lm)',
    sortKey: 'ratedLumens',
    firstSort: 'descending',
    className: 'text-right tabular-nums',
    headerClassName: 'text-right',
    cell: (p) => n(p.ratedLumens, 0),
  },
  {
    key: 'ratings',
    header: 'Ratings',
    cell: (p) => (
      <div className="flex flex-wrap gap-1">
        <Badge tone={p.location === 'wet' ? 'info' : p.location === 'damp' ? 'brand' : 'neutral'}>
          {LOCATION_LABELS[p.location]}
        </Badge>
        {p.enclosedRated ? <Badge tone="ok">Enclosed-rated</Badge> : null}
        <Badge>{DIMMING_LABELS[p.dimming]}</Badge>
      </div>
    ),
  },
];

/** The product catalogues: search, filters and sort run on the server. */
export function ProductsTable() {
  const { values, params, set, tableProps } = useListState({
    q: '',
    family: '',
    location: '',
    dimming: '',
    sort: 'modelNumber',
  });
  const list = useQuery(productQueries.list(params));

  return (
    <DataTable
      caption="Product models"
      columns={COLUMNS}
      result={list}
      loadingLabel="Loading the catalogue"
      empty={{
        icon: <Lightbulb className="size-6" />,
        title: 'No models match',
        children: 'Try another search or fewer filters.',
      }}
      errorText="Could not load the catalogue."
      {...tableProps}
      toolbar={
        <TableToolbar className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
          <SearchField
            label="Search"
            placeholder="Model number or name"
            value={values.q}
            onChange={(q) => set({ q })}
            className="sm:col-span-2 lg:col-span-1"
          />
          <FilterSelect
            label="Family"
            anyLabel="All families"
            values={PRODUCT_FAMILIES}
            labelOf={(f) => FAMILY_LABELS[f]}
            value={values.family}
            onChange={(family) => set({ family })}
          />
          <FilterSelect
            label="Location rating"
            anyLabel="Any"
            values={LOCATIONS}
            labelOf={(l) => LOCATION_LABELS[l]}
            value={values.location}
            onChange={(location) => set({ location })}
          />
          <FilterSelect
            label="Dimming"
            anyLabel="Any"
            values={DIMMINGS}
            labelOf={(d) => DIMMING_LABELS[d]}
            value={values.dimming}
            onChange={(dimming) => set({ dimming })}
          />
          <SortSelect options={SORT_OPTIONS} value={values.sort} onChange={(sort) => set({ sort })} />
        </TableToolbar>
      }
    />
  );
}
