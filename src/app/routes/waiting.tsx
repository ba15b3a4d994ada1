import { PageHeader } from '../../components/ui/page-header';
import { WaitingList } from '../../features/waiting/components/waiting-list';

export function WaitingRoute() {
  return (
    <>
      <PageHeader
        title="Waiting on you"
        description="What needs you now, oldest first. Each opens the place to act on it."
      />
      <WaitingList />
    </>
  );
}
