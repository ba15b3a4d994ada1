import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import {
  accountingMapSchema,
  type AccountingMapDto,
  type AccountingMapInput,
} from '../../../../shared/schemas/credits';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { InputField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { creditQueries } from '../api/credit-queries';
import { saveAccountingMap } from '../api/save-accounting-map';

const EMPTY: AccountingMapInput = {
  debitAccount: { code: '', name: '' },
  creditAccount: { code: '', name: '' },
  journalCode: '',
};

const valuesOf = (m: AccountingMapDto | null | undefined): AccountingMapInput =>
  m ? { debitAccount: m.debitAccount, creditAccount: m.creditAccount, journalCode: m.journalCode } : EMPTY;

/** The two accounts every credit memo is booked to, set once for the journal export. */
export function AccountingMapForm() {
  const qc = useQueryClient();
  const { notify } = useToast();
  const map = useQuery(creditQueries.accountingMap());
  const form = useForm<AccountingMapInput>({
    resolver: zodResolver(accountingMapSchema),
    defaultValues: EMPTY,
  });
  const { reset } = form;
  const current = map.data?.accountingMap;
  useEffect(() => reset(valuesOf(current)), [current, reset]);
  const mutation = useMutation({
    mutationFn: saveAccountingMap,
    onSuccess: async () => {
      notify('Accounts saved. Journals now book memos to them.');
      await qc.invalidateQueries({ queryKey: creditQueries.all });
    },
    onError: (e) => {
      if (e instanceof ApiError)
        for (const d of e.details) form.setError(d.path as keyof AccountingMapInput, { message: d.message });
    },
  });
  const errors = form.formState.errors;
  const formError =
    mutation.error instanceof ApiError && !mutation.error.details.length ? mutation.error.message : null;

  return (
    <Card>
      <CardHeader
        title="Accounts for the journal"
        description="Each credit memo debits the first account and credits the second; a reversal does the opposite."
      />
      <form
        noValidate
        aria-label="Accounts for the journal"
        className="grid gap-3 px-4 py-4 sm:grid-cols-2 sm:px-5"
        onSubmit={form.handleSubmit((v) => mutation.mutate(v))}
      >
        {formError ? (
          <p role="alert" className="rounded-lg bg-bad-50 px-3 py-2 text-sm text-bad-800 sm:col-span-2">
            {formError}
          </p>
        ) : null}
        <InputField
          label="Debit account code"
          hint="Warranty expense, or the warranty provision"
          error={errors.debitAccount?.code?.message}
          {...form.register('debitAccount.code')}
        />
        <InputField
          label="Debit account name"
          error={errors.debitAccount?.name?.message}
          {...form.register('debitAccount.name')}
        />
        <InputField
          label="Credit account code"
          hint="Contractor credits payable, or trade receivables"
          error={errors.creditAccount?.code?.message}
          {...form.register('creditAccount.code')}
        />
        <InputField
          label="Credit account name"
          error={errors.creditAccount?.name?.message}
          {...form.register('creditAccount.name')}
        />
        <InputField
          label="Journal code"
          hint="The voucher series the entries go into"
          error={errors.journalCode?.message}
          {...form.register('journalCode')}
        />
        <div className="flex items-end">
          <Button type="submit" loading={mutation.isPending}>
            Save accounts
          </Button>
        </div>
      </form>
    </Card>
  );
}
