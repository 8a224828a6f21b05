import { queryOptions } from '@tanstack/react-query';
import type { OutboxMessageView } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

/** The development outbox: what the stand-in SMTP server kept, newest first. */
export const outboxQueries = {
  all: () => ['outbox'] as const,
  list: () => queryOptions({ queryKey: [...outboxQueries.all(), 'list'] as const, queryFn: () => api<{ items: OutboxMessageView[] }>('/outbox'), refetchInterval: 5000 }),
};
