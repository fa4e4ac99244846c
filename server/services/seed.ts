import type { WorkspaceRole } from '../../shared/api/workspaces.js';
import type { Auth } from '../auth.js';
import { seedDemoLab } from '../demo/seed-demo-lab.js';
import type { Db } from '../db/client.js';
import { countUsers, findUserByEmail } from '../db/repositories/users.js';
import { insertMember } from '../db/repositories/workspaces.js';
import type { Logger } from '../logger.js';
import { publishDemoNotebook } from './publications.js';
import { createSharedWorkspace } from './workspaces.js';

/** The one password of every demo account (printed at start; demo only). */
export const DEMO_PASSWORD = 'cogbook-demo';

/** The invented lab and its people. */
export const DEMO_WORKSPACE_NAME = 'Ridgeline Test Lab';
export const DEMO_ACCOUNTS: { email: string; name: string; role: WorkspaceRole }[] = [
  { email: 'admin@ridgeline.test', name: 'Dana Ridge (lab admin)', role: 'admin' },
  { email: 'analyst@ridgeline.test', name: 'Sam Okafor (analyst)', role: 'analyst' },
  { email: 'viewer@ridgeline.test', name: 'Lee Marten (viewer)', role: 'viewer' },
];

export interface DemoServices {
  db: Db;
  auth: Auth;
  logger: Logger;
}

/** What the seed created, handed to later steps (demo notebooks, rides). */
export interface DemoSeed {
  workspaceId: string;
  users: Record<'admin' | 'analyst' | 'viewer', string>;
}

/**
 * Steps that add demo content after the accounts exist. Later features (example
 * rides, demo notebooks) push a step here; each receives the ids of what the seed made.
 */
export type DemoStep = (services: DemoServices, seed: DemoSeed) => Promise<void>;
export const demoSteps: DemoStep[] = [seedDemoLab, publishDemoNotebook];

/**
 * Creates the demo lab with an admin, an analyst and a viewer, on an empty database
 * only (so it never touches real data). Returns null when it did nothing.
 */
export async function seedDemo(services: DemoServices, steps: DemoStep[] = demoSteps): Promise<DemoSeed | null> {
  if ((await countUsers(services.db)) > 0) return null;
  const ids: Partial<DemoSeed['users']> = {};
  for (const account of DEMO_ACCOUNTS) {
    await services.auth.api.signUpEmail({ body: { email: account.email, password: DEMO_PASSWORD, name: account.name } });
    const user = await findUserByEmail(services.db, account.email);
    if (!user) throw new Error(`demo account ${account.email} was not created`);
    ids[account.role] = user.id;
  }
  const users = ids as DemoSeed['users'];
  const lab = await createSharedWorkspace(services.db, DEMO_WORKSPACE_NAME, users.admin);
  await insertMember(services.db, lab.id, users.analyst, 'analyst');
  await insertMember(services.db, lab.id, users.viewer, 'viewer');
  const seed: DemoSeed = { workspaceId: lab.id, users };
  for (const step of steps) await step(services, seed);
  services.logger.info({ workspace: DEMO_WORKSPACE_NAME }, 'demo lab created');
  return seed;
}
