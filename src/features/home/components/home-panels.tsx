import { Link } from 'react-router';
import { HardHat } from 'lucide-react';
import type { ReactNode } from 'react';
import { buttonClasses } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { PageHeader } from '../../../components/ui/page-header';

function Step({ n, title, children }: { n: number; title: string; children: ReactNode }) {
  return (
    <li className="flex gap-3">
      <span
        aria-hidden
        className="grid size-7 shrink-0 place-items-center rounded-full bg-brand-100 text-sm font-bold text-brand-800"
      >
        {n}
      </span>
      <div>
        <p className="font-medium text-ink-900">{title}</p>
        <p className="text-sm text-ink-600">{children}</p>
      </div>
    </li>
  );
}

export function InstallerHome({
  name,
  organization,
  openClaims,
}: {
  name: string;
  organization: string;
  openClaims?: ReactNode;
}) {
  return (
    <>
      <PageHeader title="Field claims" description={`${organization} · signed in as ${name}`} />
      <div className="grid gap-4 lg:grid-cols-3">
        <Card className="lg:col-span-2">
          <CardHeader
            title="Your open claims"
            description="Claims your company has filed and what each one is waiting for."
            actions={
              <Link to="/claims/new" className={buttonClasses('primary', 'sm')}>
                New claim
              </Link>
            }
          />
          {openClaims ?? (
            <EmptyState icon={<HardHat className="size-6" />} title="No open claims">
              When a fixture fails on site, file a claim from its installation with readings and photos; it
              shows up here with what the manufacturer asks of you.
            </EmptyState>
          )}
        </Card>
        <Card>
          <CardHeader title="Before you measure" />
          <ul className="space-y-4 px-4 py-4 sm:px-5">
            <Step n={1} title="Qualified persons only">
              Live readings follow NFPA 70E and your employer&apos;s procedures, with suitable PPE and a meter
              rated CAT III or IV.
            </Step>
            <Step n={2} title="De-energise when you can">
              Lock out whenever possible. LED driver outputs can exceed 50 V DC.
            </Step>
            <Step n={3} title="Photos that decide claims">
              The nameplate, the failure and the site: most manufacturers ask for at least two.
            </Step>
          </ul>
        </Card>
      </div>
    </>
  );
}
