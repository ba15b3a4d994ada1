import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { FilePlus2 } from 'lucide-react';
import { useState } from 'react';
import { useNavigate } from 'react-router';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { newIdempotencyKey } from '../../../lib/api-client';
import { createClaim } from '../api/claim-mutations';
import { claimQueries } from '../api/claim-queries';
import { CalendarDate } from '../../../components/ui/date-time';

/** Starts a draft from an installation and opens it. */
export function StartClaimButton({
  installationId,
  label = 'File a claim',
}: {
  installationId: string;
  label?: string;
}) {
  const navigate = useNavigate();
  const qc = useQueryClient();
  // One key per form start: a second tap before the first answer (or a retry after a lost one) sends the same
  // key, and the server answers the same draft instead of making another.
  const [idempotencyKey] = useState(() => newIdempotencyKey('draft'));
  const start = useMutation({
    mutationFn: () => createClaim(installationId, idempotencyKey),
    onSuccess: async (r) => {
      qc.setQueryData(claimQueries.detail(r.claim.id).queryKey, { claim: r.claim });
      await qc.invalidateQueries({ queryKey: ['claims', 'list'] });
      navigate(`/claims/${r.claim.id}`);
    },
  });
  return (
    <>
      <Button
        size="md"
        loading={start.isPending}
        onClick={() => !start.isPending && start.mutate()}
        icon={<FilePlus2 className="size-4" aria-hidden />}
      >
        {label}
      </Button>
      {start.error ? (
        <p role="alert" className="text-sm text-bad-700">
          {start.error.message}
        </p>
      ) : null}
    </>
  );
}

/** Pick the installation the failed units belong to. */
export function InstallationPicker() {
  const [q, setQ] = useState('');
  const list = useQuery(claimQueries.installations(q));
  return (
    <Card>
      <CardHeader
        title="Which installation?"
        description="Search by site, city, model or a serial number on the label."
      />
      <div className="p-4 sm:p-5">
        <InputField label="Search installations" value={q} onChange={(e) => setQ(e.target.value)} autoFocus />
      </div>
      {list.isPending ? (
        <div className="p-5">
          <Spinner label="Loading installations" />
        </div>
      ) : list.error ? (
        <p role="alert" className="p-5 text-bad-700">
          {list.error.message}
        </p>
      ) : (
        <ul className="divide-y divide-ink-100" aria-label="Installations">
          {list.data.items.map((i) => (
            <li key={i.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-5">
              <div className="min-w-0">
                <p className="font-medium text-ink-900">{i.siteName}</p>
                <p className="text-sm text-ink-600">
                  {i.quantity} × {i.product.modelNumber} · {i.manufacturer.name} · installed{' '}
                  <CalendarDate value={i.installDate} />
                </p>
              </div>
              <StartClaimButton installationId={i.id} label={`Claim on ${i.siteName}`} />
            </li>
          ))}
          {!list.data.items.length ? (
            <li className="p-5 text-sm text-ink-600">
              No installation matches. Register it under Sites first.
            </li>
          ) : null}
        </ul>
      )}
    </Card>
  );
}
