import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { devInboxKeys } from './keys';

export type CapturedMail = {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  messageId: string | null;
  subject: string;
  text: string;
  html: string | null;
};

export const getInboxQueryOptions = () =>
  queryOptions({ queryKey: devInboxKeys.all, queryFn: () => api<{ mails: CapturedMail[]; scope: 'shop' | 'own' }>('/dev/inbox'), refetchInterval: 5_000 });

export const useInbox = () => useQuery(getInboxQueryOptions());
