import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { useToast } from '../../../components/ui/toast';
import { ApiError } from '../../../lib/api-client';
import { securityQueries, setOrganizationSecurity } from '../api/security-api';

/** For administrators: require a second factor of everyone in the organisation. */
export function OrganizationSecurityCard({ organization }: { organization: { id: string; name: string } }) {
  const qc = useQueryClient();
  const { notify } = useToast();
  const setting = useQuery(securityQueries.organization());
  const required = setting.data?.organization.requireSecondFactor ?? false;
  const change = useMutation({
    mutationFn: (v: boolean) => setOrganizationSecurity(v),
    onSuccess: async ({ organization: o }) => {
      notify(
        o.requireSecondFactor
          ? 'Everyone now needs a second factor; those without one set it up at their next step.'
          : 'A second factor is optional again (except where a role requires it).',
      );
      await qc.invalidateQueries({ queryKey: securityQueries.all });
      await qc.invalidateQueries({ queryKey: ['auth', 'me'] });
    },
    onError: (e) => notify(e instanceof ApiError ? e.message : 'Could not change the setting.', 'bad'),
  });
  return (
    <Card>
      <CardHeader
        title={`${organization.name}: second factor`}
        description="Accountants and administrators of manufacturers always need one in production."
      />
      <div className="flex flex-wrap items-center justify-between gap-3 px-4 py-4 sm:px-5">
        <p className="text-sm text-ink-700">
          {required
            ? 'Everyone in your organisation must use a second factor.'
            : 'A second factor is optional for the other people in your organisation.'}
        </p>
        <Button
          variant={required ? 'secondary' : 'primary'}
          disabled={!setting.data}
          loading={change.isPending}
          onClick={() => change.mutate(!required)}
        >
          {required ? 'Make it optional' : 'Require it for everyone'}
        </Button>
      </div>
    </Card>
  );
}
