import { queryOptions } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export type MailboxMessageDto = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  attachments: { filename: string; contentType: string; size: number }[];
};

export const mailboxQueries = {
  list: () =>
    queryOptions({
      queryKey: ['mailbox', 'list'],
      queryFn: () => api<{ items: MailboxMessageDto[]; total: number }>('/mailbox'),
      refetchInterval: 5000,
    }),
};
