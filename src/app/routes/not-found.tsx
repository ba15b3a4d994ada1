import { Link } from 'react-router';
import { SearchX } from 'lucide-react';
import { buttonClasses } from '../../components/ui/button';
import { Card } from '../../components/ui/card';
import { EmptyState } from '../../components/ui/empty-state';

export function NotFoundRoute() {
  return (
    <Card>
      <EmptyState
        icon={<SearchX className="size-6" />}
        title="Page not found"
        action={
          <Link to="/" className={buttonClasses('primary')}>
            Go to home
          </Link>
        }
      >
        That address does not lead anywhere, or the record is not shared with your organisation.
      </EmptyState>
    </Card>
  );
}
