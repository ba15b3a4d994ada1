import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useMemo, useState, type FormEvent } from 'react';
import { formatDateTime, timeZones } from '../../../../shared/dates';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { SelectField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { useSession } from '../../../lib/ability';
import { ApiError } from '../../../lib/api-client';
import { organizationQueries, updateOrganization } from '../api/organization-settings';

// The languages and regions the documents and e-mails may be written for; the screens follow each reader's own.
const LOCALES: [string, string][] = [
  ['en-US', 'English (United States)'],
  ['en-CA', 'English (Canada)'],
  ['en-GB', 'English (United Kingdom)'],
  ['fr-CA', 'French (Canada)'],
  ['es-MX', 'Spanish (Mexico)'],
  ['es-US', 'Spanish (United States)'],
  ['de-DE', 'German (Germany)'],
];

/** The administrator sets the zone every time is shown in, and the locale of PDFs and e-mails. */
export function DateSettings() {
  const { user } = useSession();
  const org = user.organization;
  const qc = useQueryClient();
  const { notify } = useToast();
  const [timeZone, setTimeZone] = useState(org.timeZone);
  const [locale, setLocale] = useState(org.locale);
  const zones = useMemo(() => timeZones(), []);
  const [now] = useState(() => new Date());
  const save = useMutation({
    mutationFn: () => updateOrganization({ timeZone, locale }),
    onSuccess: async () => {
      notify('Time zone and language saved.');
      await qc.invalidateQueries({ queryKey: ['auth', 'me'] });
      await qc.invalidateQueries({ queryKey: organizationQueries.all });
    },
  });
  const err = save.error instanceof ApiError ? save.error : null;
  const submit = (e: FormEvent) => {
    e.preventDefault();
    save.mutate();
  };
  const locales = LOCALES.some(([l]) => l === locale)
    ? LOCALES
    : [...LOCALES, [locale, locale] as [string, string]];
  return (
    <Card>
      <CardHeader
        title="Dates and times"
        description="Every time in Lumenproof is shown in your organisation's time zone. Calendar dates (failed on, installed on) stay the day they are."
      />
      <form className="space-y-4 px-5 py-4" onSubmit={submit}>
        {err ? (
          <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800">
            {err.details[0]?.message ?? err.message}
          </p>
        ) : null}
        <SelectField label="Time zone" value={timeZone} onChange={(e) => setTimeZone(e.target.value)}>
          {zones.map((z) => (
            <option key={z} value={z}>
              {z.replace(/_/g, ' ')}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Language of documents and e-mails"
          hint="Screens follow each person's browser language."
          value={locale}
          onChange={(e) => setLocale(e.target.value)}
        >
          {locales.map(([value, label]) => (
            <option key={value} value={value}>
              {label}
            </option>
          ))}
        </SelectField>
        <p className="text-sm text-ink-700">
          In documents and e-mails, now reads:{' '}
          <span className="font-medium text-ink-900">{formatDateTime(now, { locale, timeZone })}</span>
        </p>
        <Button
          type="submit"
          loading={save.isPending}
          disabled={timeZone === org.timeZone && locale === org.locale}
        >
          Save
        </Button>
      </form>
    </Card>
  );
}
