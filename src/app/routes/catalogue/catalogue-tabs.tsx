import { NavLink } from 'react-router';
import { cn } from '../../../lib/cn';

/** Products and policies are two views of one catalogue. */
export function CatalogueTabs() {
  const tab = ({ isActive }: { isActive: boolean }) =>
    cn(
      'inline-flex h-11 items-center border-b-2 px-3 text-sm font-semibold',
      isActive ? 'border-brand-700 text-brand-800' : 'border-transparent text-ink-600 hover:text-ink-900',
    );
  return (
    <nav aria-label="Catalogue" className="mb-4 flex gap-2 border-b border-ink-200">
      <NavLink to="/catalogue" end className={tab}>
        Product models
      </NavLink>
      <NavLink to="/policies" className={tab}>
        Warranty policies
      </NavLink>
    </nav>
  );
}
