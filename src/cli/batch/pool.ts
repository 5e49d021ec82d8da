/**
 * Runs the jobs of a batch over worker threads (node:worker_threads), one job per worker at
 * a time, or in this thread when one worker is asked for. Can be stopped at any moment:
 * the workers are terminated and the run resolves as interrupted.
 */
import { relative } from 'node:path';
import { Worker } from 'node:worker_threads';
import { processStar } from './job.js';
import { batchMessages } from './messages.js';
import type { BatchSettings, JobOutcome, StarJob } from './types.js';
import type { WorkerRequest } from './worker.js';

/** A running batch. */
export interface JobRun {
  /** Resolves when every job is done, or when the run was stopped. */
  readonly done: Promise<{ readonly outcomes: readonly JobOutcome[]; readonly interrupted: boolean }>;
  /** Stops the run: no new job starts, the workers are terminated, `done` resolves with `interrupted: true`. */
  stop(): Promise<void>;
}

/** How a worker thread is started: the compiled worker next to this module; from TypeScript sources (tests, tsx), the .ts worker through tsx's loader. */
function startWorker(): Worker {
  const here = import.meta.url;
  if (here.endsWith('.js')) return new Worker(new URL('./worker.js', here));
  const target = new URL('./worker.ts', here).href;
  const resolveFn = (import.meta as unknown as { resolve?: (s: string) => string }).resolve;
  if (typeof resolveFn !== 'function') throw new Error('running from TypeScript sources without import.meta.resolve: use --workers 1 or the built tool');
  const api = resolveFn('tsx/esm/api');
  return new Worker(`import(${JSON.stringify(api)}).then((m) => { m.register(); return import(${JSON.stringify(target)}); });`, { eval: true });
}

/**
 * Starts the jobs.
 *
 * @param jobs the star exposures with their lamps.
 * @param settings how to reduce them.
 * @param workers number of worker threads (1 = in this thread).
 * @param onOutcome called after each job, in completion order.
 * @returns the run (`done`, `stop`).
 */
export function runJobs(jobs: readonly StarJob[], settings: BatchSettings, workers: number, onOutcome: (o: JobOutcome) => void): JobRun {
  const outcomes: JobOutcome[] = [];
  let stopped = false;
  let finish: (v: { outcomes: readonly JobOutcome[]; interrupted: boolean }) => void = () => {};
  const done = new Promise<{ outcomes: readonly JobOutcome[]; interrupted: boolean }>((r) => { finish = r; });
  const record = (o: JobOutcome) => {
    outcomes.push(o);
    onOutcome(o);
  };

  if (workers <= 1 || jobs.length <= 1) {
    // In this thread; yield to the event loop between jobs so that a stop request is seen.
    void (async () => {
      // The first job starts after the caller has set up (e.g. its signal handlers).
      await new Promise((r) => setImmediate(r));
      for (const job of jobs) {
        if (stopped) break;
        record(processStar(job, settings));
        await new Promise((r) => setImmediate(r));
      }
      finish({ outcomes, interrupted: stopped });
    })();
    return { done, stop: async () => { stopped = true; } };
  }

  const pool = new Set<Worker>();
  let next = 0;
  let active = 0;
  const shown = (p: string) => relative(settings.cwd, p) || p;
  const maybeFinish = () => {
    if (!stopped && next >= jobs.length && active === 0) {
      for (const w of pool) void w.terminate();
      pool.clear();
      finish({ outcomes, interrupted: false });
    }
  };
  const launch = () => {
    const worker = startWorker();
    pool.add(worker);
    let current: StarJob | null = null;
    const give = () => {
      if (stopped || next >= jobs.length) {
        current = null;
        pool.delete(worker);
        void worker.terminate();
        maybeFinish();
        return;
      }
      current = jobs[next++];
      active++;
      worker.postMessage({ job: current, settings } satisfies WorkerRequest);
    };
    worker.on('message', (o: JobOutcome) => {
      active--;
      current = null;
      if (!stopped) record(o);
      give();
    });
    worker.on('error', (e) => {
      // The worker died: its job fails, a fresh worker takes over the rest.
      pool.delete(worker);
      if (current && !stopped) {
        active--;
        record({ kind: 'failure', failure: { file: shown(current.star), stage: 'internal', code: 'batch.worker-died', message: batchMessages.workerDied(shown(current.star), e.message) }, milliseconds: 0 });
        current = null;
        if (next < jobs.length) launch();
        else maybeFinish();
      }
    });
    give();
  };
  const count = Math.min(workers, jobs.length);
  for (let i = 0; i < count; i++) launch();
  return {
    done,
    stop: async () => {
      if (stopped) return;
      stopped = true;
      await Promise.all([...pool].map((w) => w.terminate()));
      pool.clear();
      finish({ outcomes, interrupted: true });
    },
  };
}
