import { PageHeader } from '../../../components/ui/page-header';
import { ReviewQueue } from '../../../features/review/components/review-queue';

export function ReviewQueueRoute() {
  return (
    <>
      <PageHeader title="Review desk" description="Every claim on your products, with who it is waiting on and for how long." />
      <ReviewQueue />
    </>
  );
}
