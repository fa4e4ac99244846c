import { execFileSync, spawnSync } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { freePort } from './server.js';

/** A PostgreSQL server to create throwaway databases on. */
export interface PostgresSite {
  /** Connection URL of a database the caller may CREATE DATABASE from. */
  adminUrl: string;
  /** Where it came from, for the note of a row. */
  source: string;
  /** Stops the cluster if this process started it. */
  close(): Promise<void>;
}

/**
 * PostgreSQL for a load run: TEST_POSTGRES_URL when set; otherwise, when Debian's
 * server binaries are installed and we run as root, a throwaway cluster started as
 * .ci/run does (initdb + pg_ctl as the postgres user on 127.0.0.1, a free port,
 * socket in /tmp). Answers `{ skipped }` with the reason when neither is possible.
 */
export async function openPostgres(): Promise<PostgresSite | { skipped: string }> {
  const given = process.env.TEST_POSTGRES_URL;
  if (given) return { adminUrl: given, source: 'TEST_POSTGRES_URL', close: async () => {} };
  const versions = existsSync('/usr/lib/postgresql') ? readdirSync('/usr/lib/postgresql').filter((v) => existsSync(`/usr/lib/postgresql/${v}/bin/initdb`)) : [];
  if (versions.length === 0) return { skipped: 'no TEST_POSTGRES_URL and no /usr/lib/postgresql/*/bin/initdb (apt-get install postgresql)' };
  if (process.getuid?.() !== 0) return { skipped: 'no TEST_POSTGRES_URL, and starting a throwaway cluster needs root (runuser -u postgres)' };
  const bin = `/usr/lib/postgresql/${versions.sort((a, b) => Number(a) - Number(b)).at(-1)}/bin`;
  const dir = mkdtempSync(join(tmpdir(), 'cogbook-load-pg-'));
  const ids = (name: string) => Number(execFileSync('id', [name === 'u' ? '-u' : '-g', 'postgres'], { encoding: 'utf8' }).trim());
  chownSync(dir, ids('u'), ids('g'));
  const port = await freePort();
  const asPostgres = (args: string[]) => {
    const run = spawnSync('runuser', ['-u', 'postgres', '--', ...args], { encoding: 'utf8' });
    if (run.status !== 0) throw new Error(`${args[0]} failed (${run.status}): ${(run.stderr || run.stdout).trim().split('\n').slice(-3).join(' | ')}`);
  };
  const stop = () => spawnSync('runuser', ['-u', 'postgres', '--', `${bin}/pg_ctl`, '-D', `${dir}/data`, '-m', 'fast', 'stop'], { encoding: 'utf8' });
  try {
    asPostgres([`${bin}/initdb`, '-D', `${dir}/data`, '-A', 'trust', '-U', 'postgres']);
    asPostgres([`${bin}/pg_ctl`, '-D', `${dir}/data`, '-l', `${dir}/log`, '-w', '-o', `-c listen_addresses=127.0.0.1 -p ${port} -k /tmp`, 'start']);
  } catch (error) {
    stop();
    rmSync(dir, { recursive: true, force: true });
    return { skipped: `throwaway PostgreSQL did not start: ${error instanceof Error ? error.message : String(error)}` };
  }
  return {
    adminUrl: `postgres://postgres@127.0.0.1:${port}/postgres`,
    source: `throwaway PostgreSQL ${versions.at(-1)} cluster`,
    async close() {
      stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A fresh database on the site, and a way to drop it. */
export async function createDatabase(adminUrl: string, prefix = 'cogbook_load'): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `${prefix}_${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE ${name}`);
  } finally {
    await admin.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      const client = new pg.Client({ connectionString: adminUrl });
      await client.connect();
      try {
        await client.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
      } finally {
        await client.end();
      }
    },
  };
}
