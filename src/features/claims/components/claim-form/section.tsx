import type { ReactNode } from 'react';
import { Card, CardHeader } from '../../../../components/ui/card';

/** One numbered part of the claim form. */
export function Section({
  n,
  title,
  children,
  id,
}: {
  n: number;
  title: string;
  children: ReactNode;
  id?: string;
}) {
  return (
    <Card id={id}>
      <CardHeader title={`${n}. ${title}`} />
      <div className="space-y-4 p-4 sm:p-5">{children}</div>
    </Card>
  );
}
