import { PageHeader } from '../../components/ui/page-header';
import { AccountingMapForm } from '../../features/credits/components/accounting-map-form';
import { Balances } from '../../features/credits/components/balances';
import { CreditExport } from '../../features/credits/components/credit-export';
import { CreditsTable } from '../../features/credits/components/credits-table';
import { useAbility, useSession } from '../../lib/ability';

export function CreditsRoute() {
  const { user } = useSession();
  const ability = useAbility();
  if (user.organization.kind === 'contractor') {
    return (
      <>
        <PageHeader
          title="Credits"
          description="Credit memos from the manufacturers you file with, and your balance with each."
        />
        <div className="space-y-4">
          <Balances side="contractor" />
          <CreditsTable canVoid={false} partyLabel="Manufacturer" />
        </div>
      </>
    );
  }
  return (
    <>
      <PageHeader
        title="Credit memos"
        description="Every memo and reversal you have issued; each PDF is stored with its SHA-256."
      />
      <div className="space-y-4">
        {ability.can('export', 'CreditMemo') ? <CreditExport /> : null}
        <CreditsTable canVoid={ability.can('create', 'CreditMemo')} partyLabel="Contractor" />
        <Balances side="manufacturer" />
        {ability.can('update', 'AccountingMap') ? <AccountingMapForm /> : null}
      </div>
    </>
  );
}
