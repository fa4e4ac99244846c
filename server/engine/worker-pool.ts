import { Piscina } from 'piscina';

/** How a pool is made: the thread's module (default export = the job function), its size and time limit. */
export interface WorkerPoolOptions {
  /** Module each thread loads once; its default export is called with every job. */
  filename: URL;
  /** Threads kept warm; also the most jobs that run at once. */
  size: number;
  /** Longest one job may run, from the moment a thread picks it up. */
  timeLimitMs: number;
}

/** A job that ran past its limit; its thread was stopped and a fresh one takes its place. */
export class WorkerTimeLimitError extends Error {
  constructor(readonly limitMs: number) {
    super(`The job took longer than ${Math.round(limitMs / 1000)} s and was stopped.`);
    this.name = 'WorkerTimeLimitError';
  }
}

/** One job's options: buffers to move to the thread and a limit other than the pool's. */
export interface WorkerJobOptions {
  transferList?: ArrayBuffer[];
  timeLimitMs?: number;
}

/**
 * Warm worker threads, one job per thread at a time. Threads start with the pool and
 * stay, so module loading (the engine, zod, the FIT decoder) is paid once per thread,
 * not once per job. A job past its limit aborts: piscina terminates that thread and
 * starts a new one. A thread that crashes fails only the job it was running.
 *
 * Jobs wait here, not in piscina's queue, so a job's clock starts when a thread is
 * free for it: time spent queued behind other jobs never counts against its limit.
 */
export class WorkerPool<Job, Outcome> {
  readonly size: number;
  readonly timeLimitMs: number;
  private readonly piscina: Piscina<Job, Outcome>;
  private running = 0;
  private readonly waiting: (() => void)[] = [];

  constructor(options: WorkerPoolOptions) {
    this.size = Math.max(1, Math.floor(options.size));
    this.timeLimitMs = options.timeLimitMs;
    this.piscina = new Piscina<Job, Outcome>({
      filename: options.filename.href,
      minThreads: this.size,
      maxThreads: this.size,
      concurrentTasksPerWorker: 1,
      // Warm means never retired for being idle.
      idleTimeout: Number.POSITIVE_INFINITY,
    });
  }

  /** Jobs running now (at most `size`). */
  get active(): number {
    return this.running;
  }

  /** Jobs waiting for a free thread. */
  get queued(): number {
    return this.waiting.length;
  }

  /** Thread ids of the live threads, for health checks and tests. */
  get threadIds(): number[] {
    return this.piscina.threads.map((t) => t.threadId);
  }

  /**
   * Runs one job on a free thread. Rejects with WorkerTimeLimitError past the limit, or
   * with the thread's error when it threw or exited; other jobs are not touched.
   */
  async run(job: Job, options: WorkerJobOptions = {}): Promise<Outcome> {
    // A finishing job hands its slot straight to the next waiter, so no newcomer can slip in between.
    if (this.running >= this.size) await new Promise<void>((resolve) => this.waiting.push(resolve));
    else this.running++;
    const limitMs = options.timeLimitMs ?? this.timeLimitMs;
    const limit = new AbortController();
    const timer = setTimeout(() => limit.abort(), limitMs);
    try {
      return await this.piscina.run(job, { signal: limit.signal, ...(options.transferList ? { transferList: options.transferList } : {}) });
    } catch (error) {
      if (limit.signal.aborted) throw new WorkerTimeLimitError(limitMs);
      throw error;
    } finally {
      clearTimeout(timer);
      const next = this.waiting.shift();
      if (next) next();
      else this.running--;
    }
  }

  /** Stops every thread; running jobs are rejected. */
  async destroy(): Promise<void> {
    await this.piscina.destroy();
  }
}
