import type { MailMessage, OutboxListResponse } from '../../shared/api/outbox.js';
import { request } from './http';

export function listOutbox(): Promise<OutboxListResponse> {
  return request('/api/outbox');
}

export function getOutboxMessage(id: string): Promise<MailMessage> {
  return request(`/api/outbox/${encodeURIComponent(id)}`);
}
