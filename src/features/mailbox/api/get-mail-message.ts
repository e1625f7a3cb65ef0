import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MailMessage } from '../../../../shared/schemas/auth';
import { apiRequest } from '../../../lib/api-client';
import { mailMessagesQueryKey } from './get-mail-messages';

export const mailMessageQueryKey = (messageId: string) => [...mailMessagesQueryKey, messageId] as const;

export function fetchMailMessage(messageId: string, signal?: AbortSignal): Promise<MailMessage> {
  return apiRequest<MailMessage>(`/api/dev/mail/${encodeURIComponent(messageId)}`, { signal });
}

export function mailMessageQueryOptions(messageId: string) {
  return queryOptions({
    queryKey: mailMessageQueryKey(messageId),
    queryFn: ({ signal }) => fetchMailMessage(messageId, signal),
    // A received message never changes.
    staleTime: Infinity,
  });
}

export function useMailMessage(messageId: string) {
  return useQuery(mailMessageQueryOptions(messageId));
}
