/**
 * A pool of worker threads that stays busy and survives its workers: inputs are handed out a few
 * at a time (each worker holds at most `depth` inputs, so none waits for the main thread and
 * none holds a pre-split share that others cannot take over); results come back one by one.
 * A worker that throws or exits without answering costs one row — the input it was working on
 * gets a failure result — and is replaced; the inputs it held but had not started go back to
 * the queue.
 *
 * Worker protocol: the worker posts {ready: true} once loaded; it receives
 * {tasks: [{position, input}]} and posts {position, result} for each, in order; null asks it to stop.
 */
import { Worker } from "node:worker_threads";

/** One unit of work: its position in the batch and the input sent to the worker. */
export interface PoolTask<I> {
  position: number;
  input: I;
}

/** How the pool is run. */
export interface PoolOptions<I, R> {
  /** The worker module. */
  workerUrl: URL;
  /** Sent to every worker as workerData. */
  workerData: unknown;
  /** Number of worker threads (at most one per task). */
  jobs: number;
  tasks: readonly PoolTask<I>[];
  /** Called in the main thread for every result, as it arrives (any order). */
  onResult(position: number, result: R): void;
  /** The result recorded for an input whose worker failed or exited while working on it. */
  failure(task: PoolTask<I>, reason: string): R;
  /** Inputs held by one worker at a time (default 2). */
  depth?: number;
}

/** What the pool measured. */
export interface PoolStats {
  /** Time from creating each worker to its ready message (ms), in the order they became ready. */
  workerStartMs: number[];
  /** Workers that failed or exited while working (each cost one row). */
  workerFailures: number;
}

/** How long results of a dead worker may still arrive after its error or exit event (ms). */
const LATE_RESULT_MS = 200;

/** Consecutive workers failing before they are ready, after which the batch stops. */
const START_FAILURE_LIMIT = 3;

interface Slot<I> {
  worker: Worker;
  held: PoolTask<I>[];
  ready: boolean;
  stopping: boolean;
  gone: boolean;
  /** Set when the worker failed or exited; no more work is sent to it. */
  dying: boolean;
  created: number;
}

/**
 * Runs every task on a pool of worker threads.
 * @param options see PoolOptions
 * @returns the measurements once every task has a result
 * @throws Error when workers fail before they can start (START_FAILURE_LIMIT in a row)
 */
export function runPool<I, R>(options: PoolOptions<I, R>): Promise<PoolStats> {
  const depth = options.depth ?? 2;
  const queue: PoolTask<I>[] = [...options.tasks].reverse(); // pop() from the end = first task
  const total = options.tasks.length;
  const stats: PoolStats = { workerStartMs: [], workerFailures: 0 };
  const slots = new Set<Slot<I>>();
  let done = 0;
  let startFailures = 0;
  let settled = false;
  return new Promise((resolve, reject) => {
    if (total === 0) return resolve(stats);
    const settle = (error?: Error): void => {
      if (settled) return;
      settled = true;
      for (const slot of slots) {
        slot.stopping = true;
        void slot.worker.terminate();
      }
      if (error) reject(error);
      else resolve(stats);
    };
    const topUp = (slot: Slot<I>): void => {
      if (slot.dying) return;
      const batch: PoolTask<I>[] = [];
      while (slot.held.length + batch.length < depth && queue.length > 0) batch.push(queue.pop()!);
      if (batch.length > 0) {
        slot.held.push(...batch);
        slot.worker.postMessage({ tasks: batch });
      } else if (slot.held.length === 0 && !slot.stopping) {
        slot.stopping = true;
        slot.worker.postMessage(null);
      }
    };
    const lost = (slot: Slot<I>, reason: string): void => {
      if (slot.gone || settled) return;
      slot.gone = true;
      slots.delete(slot);
      void slot.worker.terminate();
      if (!slot.ready) {
        // Not the input's fault: the worker never started. Give its inputs back; stop if it keeps happening.
        for (const task of slot.held.reverse()) queue.push(task);
        if (++startFailures >= START_FAILURE_LIMIT) return settle(new Error(`${START_FAILURE_LIMIT} worker threads in a row stopped before they were ready (${reason})`));
      } else {
        const [culprit, ...unstarted] = slot.held;
        for (const task of unstarted.reverse()) queue.push(task);
        if (culprit) {
          stats.workerFailures++;
          options.onResult(culprit.position, options.failure(culprit, reason));
          if (++done === total) return settle();
        }
      }
      spawn();
    };
    const spawn = (): void => {
      if (queue.length === 0) return;
      const worker = new Worker(options.workerUrl, { workerData: options.workerData });
      const slot: Slot<I> = { worker, held: [], ready: false, stopping: false, gone: false, dying: false, created: performance.now() };
      slots.add(slot);
      worker.on("message", (message: { ready: true } | { position: number; result: R }) => {
        if (settled || slot.gone) return;
        if ("ready" in message) {
          slot.ready = true;
          startFailures = 0;
          stats.workerStartMs.push(performance.now() - slot.created);
          return topUp(slot);
        }
        const task = slot.held.shift();
        if (!task || task.position !== message.position) return settle(new Error(`worker answered for input ${message.position}, expected ${task?.position ?? "none"}`));
        options.onResult(message.position, message.result);
        if (++done === total) return settle();
        topUp(slot);
      });
      // Results the worker posted just before it died can arrive after its error or exit event
      // (they travel on another port), so the loss is handled a moment later: only the input
      // still unanswered then is blamed.
      const dying = (why: string): void => {
        if (slot.dying) return;
        slot.dying = true;
        setTimeout(() => lost(slot, why), LATE_RESULT_MS);
      };
      worker.on("error", (error) => dying(`the worker thread failed: ${error.message.replace(/\s*\n\s*/g, " ")}`));
      worker.on("messageerror", (error) => dying(`a worker message could not be read: ${error.message}`));
      worker.on("exit", (code) => {
        if (slot.stopping && slot.held.length === 0) {
          slots.delete(slot);
          return;
        }
        dying(`the worker thread stopped without a result (exit code ${code})`);
      });
      // Hand out work only once the worker is ready, so a slow starter holds nothing others could do.
    };
    const workers = Math.max(1, Math.min(options.jobs, total));
    for (let j = 0; j < workers; j++) spawn();
  });
}
