import type { SnapshotResult } from '../../../shared/api/snapshots.js';

export type { Snapshot, SnapshotCell, SnapshotResult } from '../../../shared/api/snapshots.js';

/** The stored form of a table output. */
export type SnapshotTableResult = Extract<SnapshotResult, { type: 'table' }>;
