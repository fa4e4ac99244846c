/**
 * The HTTP contract of the Cogbook API: zod schemas of every request and response
 * body. The server validates with them; the client imports the same schemas and types.
 * Accounts (sign-up, sign-in, sign-out, password reset) are better-auth's own routes
 * under /api/auth/* and are not described here.
 */
export * from './common.js';
export * from './errors.js';
export * from './me.js';
export * from './workspaces.js';
export * from './invitations.js';
export * from './notebooks.js';
export * from './uploads.js';
export * from './outbox.js';
export * from './snapshots.js';
export * from './runs.js';
export * from './shares.js';
export * from './publications.js';
export * from './forks.js';
export * from './exports.js';
