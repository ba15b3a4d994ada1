import { PageHeader } from '../../components/ui/page-header';
import { OrganizationSecurityCard } from '../../features/security/components/organization-security-card';
import { SecondFactorCard } from '../../features/security/components/second-factor-card';
import { SessionsCard } from '../../features/security/components/sessions-card';
import { useAbility, useSession } from '../../lib/ability';

/** One's own security: the second factor and the signed-in sessions; administrators also the organisation's rule. */
export function SecurityRoute() {
  const { user, secondFactor } = useSession();
  const ability = useAbility();
  const held = secondFactor?.required && !secondFactor.enrolled;
  return (
    <>
      <PageHeader title="Security" description="Your second factor and where you are signed in." />
      {held ? (
        <div
          role="alert"
          className="mb-4 rounded-lg border border-warn-200 bg-warn-50 px-3 py-2.5 text-sm font-medium text-warn-800"
        >
          Your account needs a second factor. Set it up below to carry on.
        </div>
      ) : null}
      <div className="space-y-5">
        <SecondFactorCard />
        {held ? null : <SessionsCard />}
        {!held && ability.can('update', 'Organization') ? (
          <OrganizationSecurityCard organization={user.organization} />
        ) : null}
      </div>
    </>
  );
}
