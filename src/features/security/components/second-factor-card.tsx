import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { ShieldCheck } from 'lucide-react';
import { confirmEnrollmentSchema } from '../../../../shared/schemas/security';
import type { EnrollmentDto } from '../../../../shared/schemas/security';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { Spinner } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { confirmEnrollment, removeSecondFactor, securityQueries, startEnrollment } from '../api/security-api';

const messageOf = (e: unknown, fallback: string) => (e instanceof ApiError ? e.message : fallback);

/** The person's own second factor: set it up (QR code, secret, a code to confirm, recovery codes) or remove it. */
export function SecondFactorCard() {
  const qc = useQueryClient();
  const status = useQuery(securityQueries.secondFactor());
  const [enrollment, setEnrollment] = useState<EnrollmentDto | null>(null);
  const [recoveryCodes, setRecoveryCodes] = useState<string[] | null>(null);

  const start = useMutation({ mutationFn: startEnrollment, onSuccess: setEnrollment });
  const refresh = async () => {
    await qc.invalidateQueries({ queryKey: securityQueries.all });
    await qc.invalidateQueries({ queryKey: ['auth', 'me'] });
  };

  let body;
  if (status.isPending) body = <Spinner label="Loading your second factor" />;
  else if (!status.data)
    body = <p role="alert">{messageOf(status.error, 'Could not load your second factor.')}</p>;
  else if (recoveryCodes)
    body = <RecoveryCodes codes={recoveryCodes} onDone={() => setRecoveryCodes(null)} />;
  else if (enrollment)
    body = (
      <Enrollment
        enrollment={enrollment}
        onConfirmed={async (codes) => {
          setEnrollment(null);
          setRecoveryCodes(codes);
          await refresh();
        }}
        onCancel={() => setEnrollment(null)}
      />
    );
  else if (status.data.enrolled)
    body = (
      <div className="space-y-4">
        <p className="text-sm text-ink-700">
          Signing in asks for a code from your authenticator app after your password.{' '}
          {status.data.recoveryCodesLeft} of 10 recovery codes left.
        </p>
        {status.data.required ? (
          <p className="text-sm text-ink-600">
            A second factor is required for your account, so it cannot be removed. If you lose your phone, an
            administrator of your organisation can reset it.
          </p>
        ) : (
          <RemoveFactor onRemoved={refresh} />
        )}
      </div>
    );
  else
    body = (
      <div className="space-y-4">
        <p className="text-sm text-ink-700">
          {status.data.required
            ? 'Your account needs a second factor before you can carry on. Set up an authenticator app now.'
            : 'Add a code from an authenticator app to your password, so that a stolen password alone cannot sign in.'}
        </p>
        {start.error ? (
          <p role="alert" className="text-sm font-medium text-bad-700">
            {messageOf(start.error, 'Could not start.')}
          </p>
        ) : null}
        <Button onClick={() => start.mutate()} loading={start.isPending}>
          Set up an authenticator app
        </Button>
      </div>
    );

  return (
    <Card>
      <CardHeader
        title="Second factor"
        description="An authenticator app (TOTP) on your phone"
        actions={
          status.data ? (
            <Badge tone={status.data.enrolled ? 'ok' : status.data.required ? 'warn' : 'neutral'}>
              <ShieldCheck className="size-3.5" aria-hidden />
              {status.data.enrolled ? 'On' : status.data.required ? 'Required' : 'Off'}
            </Badge>
          ) : null
        }
      />
      <div className="px-4 py-4 sm:px-5">{body}</div>
    </Card>
  );
}

function Enrollment({
  enrollment,
  onConfirmed,
  onCancel,
}: {
  enrollment: EnrollmentDto;
  onConfirmed: (codes: string[]) => void;
  onCancel: () => void;
}) {
  const [code, setCode] = useState('');
  const [error, setError] = useState<string | undefined>();
  const confirm = useMutation({
    mutationFn: confirmEnrollment,
    onSuccess: (r) => onConfirmed(r.recoveryCodes),
    onError: (e) => setError(messageOf(e, 'Could not confirm the code.')),
  });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = confirmEnrollmentSchema.safeParse({ code });
    if (!parsed.success) return setError(parsed.error.issues[0].message);
    setError(undefined);
    confirm.mutate(parsed.data.code);
  };
  const qr = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(enrollment.qrSvg)}`;
  return (
    <form noValidate onSubmit={submit} className="space-y-4">
      <ol className="list-decimal space-y-1 pl-5 text-sm text-ink-700">
        <li>Scan the QR code with your authenticator app, or type the secret into it.</li>
        <li>Enter the six-digit code the app shows.</li>
      </ol>
      <div className="flex flex-wrap items-center gap-4">
        <img
          src={qr}
          alt="QR code for your authenticator app"
          width={176}
          height={176}
          className="rounded-lg border border-ink-200 bg-white"
        />
        <div className="min-w-0">
          <p className="text-sm font-medium text-ink-800">Secret</p>
          <p
            className="font-mono text-sm break-all text-ink-950 select-all"
            data-testid="totp-secret"
            aria-label="Secret for your authenticator app"
          >
            {enrollment.secret}
          </p>
        </div>
      </div>
      <InputField
        label="Code from the app"
        name="code"
        inputMode="numeric"
        autoComplete="one-time-code"
        maxLength={6}
        value={code}
        onChange={(e) => setCode(e.target.value.replace(/\s/g, ''))}
        error={error}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={confirm.isPending}>
          Confirm
        </Button>
        <Button type="button" variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function RecoveryCodes({ codes, onDone }: { codes: string[]; onDone: () => void }) {
  return (
    <div className="space-y-4">
      <div role="status" className="rounded-lg border border-ok-200 bg-ok-50 px-3 py-2.5 text-sm text-ok-800">
        Your second factor is on.
      </div>
      <p className="text-sm text-ink-700">
        Keep these recovery codes somewhere safe. Each signs in once without your phone. They are shown only
        now.
      </p>
      <ul aria-label="Recovery codes" className="grid grid-cols-2 gap-2 font-mono text-sm text-ink-950">
        {codes.map((c) => (
          <li key={c} className="rounded-md bg-ink-50 px-2 py-1">
            {c}
          </li>
        ))}
      </ul>
      <Button onClick={onDone}>I have saved them</Button>
    </div>
  );
}

function RemoveFactor({ onRemoved }: { onRemoved: () => Promise<void> }) {
  const [open, setOpen] = useState(false);
  const [password, setPassword] = useState('');
  const { notify } = useToast();
  const remove = useMutation({
    mutationFn: removeSecondFactor,
    onSuccess: async () => {
      notify('Your second factor is off.');
      setOpen(false);
      await onRemoved();
    },
  });
  if (!open)
    return (
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Remove second factor
      </Button>
    );
  return (
    <form
      noValidate
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        if (password) remove.mutate(password);
      }}
    >
      <InputField
        label="Your password"
        type="password"
        autoComplete="current-password"
        value={password}
        onChange={(e) => setPassword(e.target.value)}
        error={remove.error ? messageOf(remove.error, 'Could not remove it.') : undefined}
      />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" loading={remove.isPending}>
          Remove
        </Button>
        <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
