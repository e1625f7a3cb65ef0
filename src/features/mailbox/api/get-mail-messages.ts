import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MailMessageSummary } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';

export const mailMessagesQueryKey = ['dev-mail'] as const;

/** What the local mail stand-in has received, newest first (lead only, development only). */
export function fetchMailMessages(signal?: AbortSignal): Promise<{ messages: MailMessageSummary[] }> {
  return apiRequest<{ messages: MailMessageSummary[] }>('/api/dev/mail', { signal });
}

export function mailMessagesQueryOptions() {
  return queryOptions({
    queryKey: mailMessagesQueryKey,
    queryFn: ({ signal }) => fetchMailMessages(signal),
    // New mail arrives from the server's side (invitations, resets), so look again now and then.
    refetchInterval: 10_000,
  });
}

export function useMailMessages() {
  return useQuery(mailMessagesQueryOptions());
}
