import { formatAmount } from '../../../../shared/money';

export function Money({
  amount,
  currency,
  className,
}: {
  amount: string | null;
  currency: string | null;
  className?: string;
}) {
  if (amount === null) return <span className={className}>–</span>;
  return (
    <span className={`tabular-nums ${className ?? ''}`}>
      {formatAmount(amount)} <span className="text-xs text-ink-600">{currency}</span>
    </span>
  );
}

export const shortDate = (iso: string) => iso.slice(0, 10);
