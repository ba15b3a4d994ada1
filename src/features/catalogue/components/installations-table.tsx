import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router';
import { MapPin } from 'lucide-react';
import {
  ENCLOSURE_LABELS,
  ENCLOSURES,
  LOCATION_LABELS,
  LOCATIONS,
  NOMINAL_SUPPLY_VOLTS,
  type InstallationDto,
} from '../../../../shared/schemas/catalogue';
import {
  DataTable,
  FilterSelect,
  SearchField,
  SortSelect,
  TableToolbar,
  useListState,
  type Column,
} from '../../../components/ui/data-table';
import { useSession } from '../../../lib/ability';
import { installationQueries } from '../api/installation-queries';
import { CalendarDate } from '../../../components/ui/date-time';

const SORTS = [
  ['-installDate', 'Installed, newest first'],
  ['installDate', 'Installed, oldest first'],
  ['siteName', 'Site name'],
  ['-siteName', 'Site name, Z to A'],
  ['-quantity', 'Quantity, largest first'],
  ['quantity', 'Quantity, smallest first'],
  ['-createdAt', 'Registered, newest first'],
] as const;

/** The columns; the third names the other party: the manufacturer for a contractor, the contractor for a manufacturer. */
function columns(other: 'manufacturer' | 'contractor'): Column<InstallationDto>[] {
  return [
    {
      key: 'site',
      header: 'Site',
      sortKey: 'siteName',
      cell: (i) => (
        <Link
          to={`/installations/${i.id}`}
          className="inline-flex min-h-11 flex-col justify-center font-medium text-brand-800 hover:underline"
        >
          {i.siteName}
          <span className="text-xs font-normal text-ink-600">
            {i.siteCity}, {i.siteRegion}
          </span>
        </Link>
      ),
    },
    { key: 'product', header: 'Product', className: 'whitespace-nowrap', cell: (i) => i.product.modelNumber },
    {
      key: 'party',
      header: other === 'manufacturer' ? 'Manufacturer' : 'Contractor',
      className: 'whitespace-nowrap',
      cell: (i) => (other === 'manufacturer' ? i.manufacturer.name : i.contractor.name),
    },
    {
      key: 'units',
      header: 'Units',
      sortKey: 'quantity',
      firstSort: 'descending',
      className: 'text-right tabular-nums',
      headerClassName: 'text-right',
      cell: (i) => i.quantity,
    },
    {
      key: 'installed',
      header: 'Installed',
      sortKey: 'installDate',
      firstSort: 'descending',
      className: 'whitespace-nowrap tabular-nums',
      cell: (i) => <CalendarDate value={i.installDate} />,
    },
    {
      key: 'conditions',
      header: 'Conditions',
      className: 'text-xs whitespace-nowrap text-ink-700',
      headerClassName: '',
      cell: (i) =>
        `${LOCATION_LABELS[i.location]} · ${ENCLOSURE_LABELS[i.enclosure]} · ${i.nominalSupplyVolts} V`,
    },
  ];
}

export function InstallationsTable() {
  const { user } = useSession();
  const { values, params, set, tableProps } = useListState({
    q: '',
    location: '',
    enclosure: '',
    nominalSupplyVolts: '',
    sort: '-installDate',
  });
  const list = useQuery(installationQueries.list(params));
  const other = user.organization.kind === 'contractor' ? 'manufacturer' : 'contractor';

  return (
    <DataTable
      caption="Installations"
      columns={columns(other)}
      result={list}
      loadingLabel="Loading installations"
      empty={{
        icon: <MapPin className="size-6" />,
        title: 'No installations match',
        children: 'Try another search or fewer filters.',
      }}
      errorText="Could not load installations."
      {...tableProps}
      toolbar={
        <TableToolbar className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
          <SearchField
            label="Search"
            placeholder="Site, city, invoice, serial or model"
            value={values.q}
            onChange={(q) => set({ q })}
            className="sm:col-span-2 lg:col-span-1"
          />
          <FilterSelect
            label="Location"
            anyLabel="Any"
            values={LOCATIONS}
            labelOf={(l) => LOCATION_LABELS[l]}
            value={values.location}
            onChange={(location) => set({ location })}
          />
          <FilterSelect
            label="Enclosure"
            anyLabel="Any"
            values={ENCLOSURES}
            labelOf={(x) => ENCLOSURE_LABELS[x]}
            value={values.enclosure}
            onChange={(enclosure) => set({ enclosure })}
          />
          <FilterSelect
            label="Nominal supply (V)"
            anyLabel="Any"
            values={NOMINAL_SUPPLY_VOLTS}
            labelOf={(v) => `${v} V`}
            value={values.nominalSupplyVolts}
            onChange={(nominalSupplyVolts) => set({ nominalSupplyVolts })}
          />
          <SortSelect options={SORTS} value={values.sort} onChange={(sort) => set({ sort })} />
        </TableToolbar>
      }
    />
  );
}
