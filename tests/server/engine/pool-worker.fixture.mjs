// Thread module for the worker-pool tests: plain JS, so it loads without a TypeScript loader.
import { threadId } from 'node:worker_threads';

const loadedAt = Date.now();

export default async function job(task) {
  const startedAt = Date.now();
  if (task.kind === 'sleep') await new Promise((resolve) => setTimeout(resolve, task.ms));
  if (task.kind === 'spin') {
    const end = Date.now() + task.ms;
    while (Date.now() < end);
  }
  if (task.kind === 'exit') process.exit(7);
  if (task.kind === 'throw-outside') {
    setTimeout(() => {
      throw new Error('thread fell over');
    }, 1);
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  if (task.kind === 'bytes') return { threadId, loadedAt, startedAt, endedAt: Date.now(), sum: new Uint8Array(task.buffer).reduce((a, b) => a + b, 0) };
  return { threadId, loadedAt, startedAt, endedAt: Date.now() };
}
