import { Link } from 'react-router';
import { buttonClasses } from '../../../components/ui/button';
import { PageHeader } from '../../../components/ui/page-header';
import { CreditDesk } from './credit-desk';
import { WarrantyCostPanel } from './warranty-cost';

/** The accountant's home: the queue of approved claims and the warranty cost. */
export function AccountantDesk({ name, organization }: { name: string; organization: string }) {
  return (
    <>
      <PageHeader
        title="Credits and warranty cost"
        description={`${organization} · signed in as ${name}`}
        actions={
          <Link to="/credits" className={buttonClasses('secondary')}>
            All credit memos
          </Link>
        }
      />
      <div className="space-y-4">
        <CreditDesk />
        <WarrantyCostPanel />
      </div>
    </>
  );
}
