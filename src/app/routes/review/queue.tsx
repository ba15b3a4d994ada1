import { PageHeader } from '../../../components/ui/page-header';
import { ReviewQueue } from '../../../features/review/components/review-queue';
import { useSession } from '../../../lib/ability';

export function ReviewQueueRoute() {
  const manufacturerId = useSession().user.organization.id;
  return (
    <>
      <PageHeader
        title="Review desk"
        description="Every claim on your products, with who it is waiting on and for how long."
      />
      <ReviewQueue manufacturerId={manufacturerId} />
    </>
  );
}
