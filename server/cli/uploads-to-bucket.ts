import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { UsageError } from './compare-args.js';
import { runCommand } from './run-command.js';

export const UPLOADS_TO_BUCKET_USAGE = `Usage: npm run uploads:to-bucket [-- --dry-run]

Moves the bytes of uploads kept in the database into the S3-compatible bucket named by
COGBOOK_S3_BUCKET (with COGBOOK_S3_ENDPOINT, COGBOOK_S3_REGION, COGBOOK_S3_PREFIX and the
usual AWS_ACCESS_KEY_ID / AWS_SECRET_ACCESS_KEY), one upload at a time: it puts the object
under the upload's sha256, reads it back, checks its size and sha256, and only then clears
the database copy. Stop it at any point and run it again: uploads already moved are done,
and an object already in the bucket is checked, not sent again.

The database: DATABASE_URL, else the embedded one in DATA_DIR (default ./data), which needs
the server stopped. On PostgreSQL, start every app process with the bucket set first.

  --dry-run  count what would move and check the bucket; change nothing

Exit codes: 0 everything is in the bucket (or nothing was left to move), 1 some uploads
stayed in the database (each is named with the reason), 2 bad input or settings.`;

function parseArgs(argv: string[]): { help: boolean; dryRun: boolean } {
  const args = { help: false, dryRun: false };
  for (const arg of argv) {
    if (arg === '--help' || arg === '-h') args.help = true;
    else if (arg === '--dry-run') args.dryRun = true;
    else throw new UsageError(`unknown argument ${arg} (see --help)`);
  }
  return args;
}

const mb = (bytes: number) => `${(bytes / 1_048_576).toFixed(1)} MB`;

async function main(argv: string[]): Promise<number> {
  const args = parseArgs(argv);
  if (args.help) {
    process.stdout.write(`${UPLOADS_TO_BUCKET_USAGE}\n`);
    return 0;
  }
  const { loadConfig } = await import('../config.js');
  // Only the settings this command uses, checked as the server checks them. It signs nothing:
  // a stand-in secret keeps it from writing one into DATA_DIR.
  const used = Object.fromEntries(Object.entries(process.env).filter(([k]) => k === 'DATA_DIR' || k === 'DATABASE_URL' || k.startsWith('COGBOOK_S3_')));
  let config;
  try {
    config = loadConfig({ ...used, AUTH_SECRET: 'x'.repeat(32) });
  } catch (error) {
    throw new UsageError((error as Error).message.replace(/\n\s*/g, ' '));
  }
  if (!config.s3) throw new UsageError('COGBOOK_S3_BUCKET is not set: name the bucket to move the uploads into (and COGBOOK_S3_ENDPOINT for an S3-compatible server)');

  const { openObjectStore } = await import('../storage/open-blob-store.js');
  let store;
  try {
    store = (await openObjectStore(config.s3))!;
  } catch (error) {
    throw new UsageError((error as Error).message);
  }

  const { openDatabase, pgliteDirOf } = await import('../db/client.js');
  const { acquireDataDirLock, DataDirLockedError } = await import('../db/data-lock.js');
  let lock: { release(): void } | undefined;
  if (!config.databaseUrl) {
    if (!existsSync(pgliteDirOf(config.dataDir))) throw new UsageError(`no Cogbook database in ${config.dataDir} (set DATA_DIR or DATABASE_URL)`);
    try {
      lock = acquireDataDirLock(config.dataDir);
    } catch (error) {
      if (error instanceof DataDirLockedError) throw new UsageError(`${error.message.replace(/ or choose another DATA_DIR/, '')}: the embedded database takes one process at a time`);
      throw error;
    }
  }
  try {
    const database = await openDatabase({
      databaseUrl: config.databaseUrl,
      pgliteDir: config.databaseUrl ? undefined : pgliteDirOf(config.dataDir),
      migrationsFolder: join(config.rootDir, 'drizzle'),
    });
    try {
      const { moveUploadsToBucket } = await import('../storage/move-to-bucket.js');
      const out = (line: string) => process.stdout.write(`${line}\n`);
      out(`${args.dryRun ? 'Would move' : 'Moving'} uploads from the database to ${store.location}`);
      const report = await moveUploadsToBucket(database.db, store, {
        dryRun: args.dryRun,
        onUpload: (u, outcome, reason) => {
          if (outcome === 'failed') process.stderr.write(`upload ${u.id} (${u.fileName}) stays in the database: ${reason}\n`);
        },
      });
      out(`before: ${report.before.inDatabase} in the database (${mb(report.before.inDatabaseBytes)}), ${report.before.inBucket} in the bucket`);
      out(
        args.dryRun
          ? `would move: ${report.moved} (${mb(report.movedBytes)}); already in the bucket, checked: ${report.alreadyThere}; could not be moved: ${report.failed.length}`
          : `moved: ${report.moved} (${mb(report.movedBytes)}); already in the bucket, checked: ${report.alreadyThere}; failed: ${report.failed.length}`,
      );
      if (!args.dryRun) out(`after: ${report.after.inDatabase} in the database, ${report.after.inBucket} in the bucket`);
      if (report.stoppedBy) out(`stopped early: ${report.stoppedBy}. Run the command again once that is fixed; what moved stays moved.`);
      return report.failed.length > 0 ? 1 : 0;
    } finally {
      await database.close();
    }
  } finally {
    lock?.release();
  }
}

runCommand('uploads:to-bucket', main);
