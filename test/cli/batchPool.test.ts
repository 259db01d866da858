import { describe, expect, it } from "vitest";
import { runPool } from "../../cli/batchPool.js";

const FAULTY = new URL("./fixtures/faultyWorker.mjs", import.meta.url);

// The expected rows are the inputs themselves (the fixture worker echoes "ok:<input>"); a failed
// input must get exactly one failure row and no input may be lost or done twice (hand count).
async function pool(inputs: string[], jobs: number, worker = FAULTY) {
  const results = new Map<number, string>();
  const calls: number[] = [];
  const stats = await runPool<string, string>({
    workerUrl: worker,
    workerData: null,
    jobs,
    tasks: inputs.map((input, position) => ({ position, input })),
    onResult: (position, result) => { calls.push(position); results.set(position, result); },
    failure: (task, reason) => `failed:${task.input}:${reason}`,
  });
  return { results, calls, stats };
}

describe("runPool({ workerUrl, jobs, tasks, onResult, failure })", () => {
  it("runPool over 40 inputs with 3 workers: every input answered once", async () => {
    const inputs = Array.from({ length: 40 }, (_, i) => `f${i}`);
    const { results, calls, stats } = await pool(inputs, 3);
    expect(calls.sort((a, b) => a - b)).toEqual(inputs.map((_, i) => i));
    expect([...results.values()].every((r) => r.startsWith("ok:"))).toBe(true);
    // Work goes only to ready workers, so a quick first worker may finish before the others start.
    expect(stats.workerStartMs.length).toBeGreaterThanOrEqual(1);
    expect(stats.workerStartMs.length).toBeLessThanOrEqual(3);
    expect(stats.workerFailures).toBe(0);
  }, 60_000);

  it("runPool with a worker that throws and one that exits silently: those two rows report it, the other 20 are done", async () => {
    const inputs = Array.from({ length: 22 }, (_, i) => (i === 5 ? "throw" : i === 13 ? "exit" : `f${i}`));
    const { results, calls, stats } = await pool(inputs, 2);
    expect(calls.sort((a, b) => a - b)).toEqual(inputs.map((_, i) => i));
    expect(results.get(5)).toMatch(/^failed:throw:the worker thread failed: simulated failure/);
    expect(results.get(13)).toMatch(/^failed:exit:the worker thread stopped without a result \(exit code 3\)/);
    for (const [position, result] of results) if (position !== 5 && position !== 13) expect(result).toBe(`ok:${inputs[position]}`);
    expect(stats.workerFailures).toBe(2);
  }, 60_000);

  it("runPool where every input kills its worker: all rows are failures, the pool still ends", async () => {
    const { results } = await pool(["exit", "exit", "throw", "exit"], 2);
    expect([...results.values()].every((r) => r.startsWith("failed:"))).toBe(true);
    expect(results.size).toBe(4);
  }, 60_000);

  it("runPool with workers that cannot start rejects with the reason instead of blaming the inputs", async () => {
    await expect(pool(["a", "b", "c"], 2, new URL("./fixtures/neverReadyWorker.mjs", import.meta.url))).rejects.toThrow(/worker threads in a row stopped before they were ready \(the worker thread failed: cannot load\)/);
  }, 60_000);
});
