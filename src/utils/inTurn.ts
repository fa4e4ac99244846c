/**
 * Heavy page work done one piece per task. Opening a notebook draws every chart and makes
 * every code editor at about the same moment; done in one go, that is one long task that
 * freezes the page (typing, scrolling) until all are done. Queued here, each piece starts in
 * a task of its own, so the browser can paint and handle input between them.
 */
const queue: (() => void)[] = [];
let scheduled = false;

function next(): void {
  scheduled = false;
  const work = queue.shift();
  if (!work) return;
  work();
  schedule();
}

function schedule(): void {
  if (scheduled || queue.length === 0) return;
  scheduled = true;
  // A message to ourselves runs as a new task, without setTimeout's clamping.
  const channel = new MessageChannel();
  channel.port1.onmessage = () => {
    channel.port1.close();
    next();
  };
  channel.port2.postMessage(null);
}

/**
 * Runs `work` in a task of its own once the pieces queued before it have started; answers
 * its result. The synchronous part of `work` is what gets a task to itself.
 */
export function inTurn<T>(work: () => T | Promise<T>): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    queue.push(() => {
      try {
        Promise.resolve(work()).then(resolve, reject);
      } catch (e) {
        reject(e);
      }
    });
    schedule();
  });
}
