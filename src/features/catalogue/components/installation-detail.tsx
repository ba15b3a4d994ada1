import { Link } from 'react-router';
import {
  DIMMER_LABELS,
  ENCLOSURE_LABELS,
  LOCATION_LABELS,
  type InstallationDetailDto,
} from '../../../../shared/schemas/catalogue';
import { Card, CardHeader } from '../../../components/ui/card';
import { FitWarnings } from './fit-warnings';
import { n } from './format';
import { CalendarDate, useDateText } from '../../../components/ui/date-time';

export function InstallationDetail({ installation: i }: { installation: InstallationDetailDto }) {
  const dates = useDateText();
  const rows: [string, string][] = [
    ['Site', `${i.siteName}, ${i.siteAddress}, ${i.siteCity}, ${i.siteRegion} ${i.sitePostalCode}`],
    ['Contractor', i.contractor.name],
    ['Manufacturer', i.manufacturer.name],
    ['Quantity', `${i.quantity} units (${i.serialCount} serials on file)`],
    ['Lot (date code)', i.lot ?? 'Not given'],
    ['Installed', dates.calendar(i.installDate)],
    ['Purchased', i.purchaseDate ? dates.calendar(i.purchaseDate) : 'Not given'],
    ['Distributor and invoice', [i.distributor, i.invoiceNumber].filter(Boolean).join(' · ') || 'Not given'],
    ['Location', LOCATION_LABELS[i.location]],
    ['Enclosure', ENCLOSURE_LABELS[i.enclosure]],
    ['Dimmer', DIMMER_LABELS[i.dimmer]],
    ['Nominal supply', `${i.nominalSupplyVolts} V`],
    ['Hours of use a day', `${n(i.hoursPerDay)} h`],
    ['Ambient temperature', `${n(i.ambientC)} °C`],
  ];
  return (
    <div className="grid gap-5 lg:grid-cols-3">
      <Card className="lg:col-span-2">
        <CardHeader
          title={
            <Link to={`/catalogue/${i.product.id}`} className="text-brand-800 hover:underline">
              {i.product.modelNumber} · {i.product.name}
            </Link>
          }
        />
        <dl className="grid gap-x-6 gap-y-3 p-4 sm:grid-cols-2 sm:p-5">
          {rows.map(([k, v]) => (
            <div key={k} className="min-w-0">
              <dt className="text-xs font-medium tracking-wide text-ink-600 uppercase">{k}</dt>
              <dd className="text-sm break-words text-ink-900">{v}</dd>
            </div>
          ))}
        </dl>
        <div className="px-4 pb-4 sm:px-5">
          <FitWarnings warnings={i.fit} />
        </div>
      </Card>
      <div className="space-y-5">
        <Card>
          <CardHeader title="Warranty" />
          <p className="p-4 text-sm sm:p-5">
            {i.policyVersion ? (
              <>
                Judged by{' '}
                <Link
                  to={`/policies/${i.policyVersion.policyId}`}
                  className="font-medium text-brand-800 underline"
                >
                  {i.policyVersion.policyName}, version {i.policyVersion.versionNumber}
                </Link>{' '}
                (in force from <CalendarDate value={i.policyVersion.effectiveFrom} />, on the{' '}
                {i.purchaseDate ? 'purchase' : 'install'} date).
              </>
            ) : (
              'No warranty policy was in force for this model on the purchase or install date.'
            )}
          </p>
        </Card>
        <Card>
          <CardHeader title="Serial numbers and date codes" />
          {i.serials.length ? (
            <ul className="flex max-h-64 flex-wrap gap-1.5 overflow-y-auto p-4 sm:p-5">
              {i.serials.map((s) => (
                <li key={s} className="rounded bg-ink-100 px-2 py-0.5 font-mono text-xs">
                  {s}
                </li>
              ))}
            </ul>
          ) : (
            <p className="p-4 text-sm text-ink-600">None recorded.</p>
          )}
        </Card>
      </div>
    </div>
  );
}
