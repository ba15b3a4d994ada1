import { PageHeader } from '../../../components/ui/page-header';
import { WarrantyReserve } from '../../../features/analytics/components/warranty-reserve';

export function ReserveRoute() {
  return (
    <>
      <PageHeader
        title="Warranty reserve"
        description="Claims expected from the units still working, from each model's fitted life, conditional on having lasted to today, capped at the term and prorated by coverage."
      />
      <WarrantyReserve />
    </>
  );
}
