import type { HealthResponse, MeResponse } from '../../shared/api/me.js';
import type { Database } from '../db/client.js';
import { findUserById, ping } from '../db/repositories/users.js';
import { unauthenticated } from '../errors.js';
import { listWorkspaces } from './workspaces.js';

export async function getMe(database: Database, userId: string): Promise<MeResponse> {
  const user = await findUserById(database.db, userId);
  if (!user) throw unauthenticated();
  return { user, workspaces: await listWorkspaces(database.db, userId) };
}

export async function checkHealth(database: Database, version: string): Promise<HealthResponse> {
  await ping(database.db);
  return { status: 'ok', database: database.kind, version };
}
