import { PageHeader } from '../../components/ui/page-header';
import { WaitingList } from '../../features/waiting/components/waiting-list';
import { WaitingMailChoice } from '../../features/waiting/components/waiting-mail';

export function WaitingRoute() {
  return (
    <>
      <PageHeader
        title="Waiting on you"
        description="What needs you now, oldest first. Each opens the place to act on it."
      />
      <div className="space-y-4">
        <WaitingList />
        <WaitingMailChoice />
      </div>
    </>
  );
}
