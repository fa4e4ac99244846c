#!/usr/bin/env node
// `npm start`: build what is stale, then run the built server in this process.
// `npm run dev`: the API under tsx --watch plus the Vite dev server, together.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const bin = (name) => join(root, 'node_modules', '.bin', name);

/** Newest modification time under the given files/folders (0 when none exist). */
function newest(paths) {
  let max = 0;
  const visit = (p) => {
    if (!existsSync(p)) return;
    const st = statSync(p);
    if (st.isDirectory()) {
      for (const entry of readdirSync(p)) {
        if (entry !== 'node_modules' && !entry.startsWith('.')) visit(join(p, entry));
      }
    } else if (st.mtimeMs > max) max = st.mtimeMs;
  };
  for (const p of paths) visit(join(root, p));
  return max;
}

/** Oldest output file: a build is stale if any input is newer than this. */
function builtAt(marker) {
  const p = join(root, marker);
  return existsSync(p) ? statSync(p).mtimeMs : 0;
}

function run(label, command, args) {
  process.stdout.write(`cogbook: ${label}...\n`);
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  return result.status === 0;
}

function buildClientIfStale() {
  const inputs = ['src', 'workers', 'shared', 'index.html', 'vite.config.ts', 'public'];
  if (builtAt('dist/client/index.html') >= newest(inputs)) return;
  if (!existsSync(join(root, 'index.html')) || !existsSync(join(root, 'src', 'main.ts'))) {
    process.stderr.write('cogbook: the web client (index.html, src/main.ts) is not there yet; starting the API only.\n');
    return;
  }
  if (!run('building the web client (vite build)', bin('vite'), ['build', '--logLevel', 'warn'])) {
    process.stderr.write('cogbook: the web client did not build (see above); starting the API only. Fix the error and run npm start again.\n');
  }
}

/** tsc -b info is rewritten on every build that changed anything; unchanged .js files are not. */
function serverBuiltAt() {
  return existsSync(join(root, 'dist/node/server/index.js')) ? builtAt('dist/node/.tsbuildinfo') : 0;
}

function buildServerIfStale() {
  const inputs = ['server', 'shared'];
  if (serverBuiltAt() >= newest(inputs)) return;
  const before = serverBuiltAt();
  if (!run('building the server (tsc)', bin('tsc'), ['-p', 'server/tsconfig.build.json'])) {
    // tsc still writes JavaScript when it reports type errors; run that, loudly.
    if (serverBuiltAt() > before) {
      process.stderr.write('cogbook: the server has type errors (see above); starting the emitted code anyway.\n');
      return;
    }
    process.stderr.write('cogbook: the server did not compile (see above).\n');
    process.exit(1);
  }
}

async function start() {
  buildClientIfStale();
  buildServerIfStale();
  await import(pathToFileURL(join(root, 'dist', 'node', 'server', 'index.js')).href);
}

function dev() {
  const apiPort = process.env.PORT ?? '3000';
  const env = {
    ...process.env,
    PORT: apiPort,
    // Pages come from Vite on 5173 and reach the API through its proxy.
    BASE_URL: process.env.BASE_URL ?? 'http://localhost:5173',
    TRUSTED_ORIGINS: [process.env.TRUSTED_ORIGINS, `http://localhost:${apiPort}`, `http://127.0.0.1:${apiPort}`].filter(Boolean).join(','),
  };
  const children = [
    spawn(process.execPath, ['--import', 'tsx', '--watch', 'server/index.ts'], { cwd: root, env, stdio: 'inherit' }),
    spawn(bin('vite'), [], { cwd: root, env, stdio: 'inherit' }),
  ];
  let stopping = false;
  const stopAll = (signal) => {
    if (stopping) return;
    stopping = true;
    for (const c of children) if (c.exitCode === null) c.kill(signal);
  };
  for (const c of children) {
    c.on('exit', (code) => {
      stopAll('SIGTERM');
      if (children.every((x) => x.exitCode !== null || x.signalCode !== null)) process.exit(code ?? 0);
    });
  }
  process.on('SIGINT', () => stopAll('SIGINT'));
  process.on('SIGTERM', () => stopAll('SIGTERM'));
}

if (process.argv.includes('--dev')) dev();
else await start();
