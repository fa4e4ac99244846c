import type { MeResponse } from '../../shared/api/me.js';
import { request } from './http';

/** The signed-in user and their workspaces; throws ApiError 401 when signed out. */
export function fetchMe(signal?: AbortSignal): Promise<MeResponse> {
  return request<MeResponse>('/api/me', { signal });
}
