import { useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { organizationSettingsSchema } from '../../../../shared/schemas/organizations';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { organizationQueries, updateOrganization } from '../api/organization-settings';

/** A manufacturer administrator's setting: the amount above which a credit needs a second accountant. */
export function CreditApprovalSetting() {
  const qc = useQueryClient();
  const { notify } = useToast();
  const current = useQuery(organizationQueries.current());
  const [draft, setDraft] = useState<string | null>(null);
  const [error, setError] = useState<string | undefined>();
  const saved = current.data?.organization.creditSecondApprovalAbove ?? '';
  const value = draft ?? saved;
  const save = useMutation({
    mutationFn: updateOrganization,
    onSuccess: async ({ organization }) => {
      setDraft(null);
      notify(
        organization.creditSecondApprovalAbove
          ? `Credits above ${organization.creditSecondApprovalAbove} now need a second accountant.`
          : 'Every credit is issued by one accountant again.',
      );
      await qc.invalidateQueries({ queryKey: organizationQueries.all });
    },
    onError: (e) =>
      setError(e instanceof ApiError ? (e.details[0]?.message ?? e.message) : 'Could not save.'),
  });

  function submit(e: FormEvent) {
    e.preventDefault();
    const parsed = organizationSettingsSchema.safeParse({ creditSecondApprovalAbove: value.trim() || null });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message);
    setError(undefined);
    save.mutate(parsed.data);
  }

  return (
    <Card className="mt-6">
      <CardHeader
        title="Second approval of credits"
        description="A credit memo above this amount is issued only when two different accountants have approved it. Leave it empty to let one accountant issue any credit."
      />
      <form className="flex flex-wrap items-end gap-3 px-4 py-4 sm:px-5" onSubmit={submit}>
        <InputField
          label="Second approval above"
          inputMode="decimal"
          placeholder="No second approval"
          value={value}
          error={error}
          onChange={(e) => setDraft(e.target.value)}
          className="w-56"
        />
        <Button type="submit" loading={save.isPending} disabled={current.isPending}>
          Save
        </Button>
      </form>
    </Card>
  );
}
