/** `fringekit batch FILES|FOLDERS... [--model ID] [--jobs N] --out results.csv|.json`. */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import { batchCsv, batchRow, type BatchRow } from "../batchRow.js";
import { expandFolders, writeOutputFile } from "../files.js";
import { parseArgs, type ParsedArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";
import { DEFAULT_MODEL, FIT_OPTIONS } from "./fit.js";

/** Runs the batch command: every file is fitted in a pool of worker threads. */
export async function batchCommand(words: readonly string[]): Promise<CommandOutput> {
  const { json: _json, out: _out, ...fitOptions } = FIT_OPTIONS;
  const args = parseArgs(words, { ...fitOptions, model: { kind: "value" }, jobs: { kind: "value" }, out: { kind: "value" } }, "batch");
  if (args.positionals.length === 0) throw new UsageError("batch needs at least one data file or folder");
  const files = expandFolders(args.positionals);
  const out = args.values.get("out");
  if (out === undefined || !/\.(csv|json)$/i.test(out)) throw new UsageError("batch needs --out results.csv or --out results.json");
  const jobsText = args.values.get("jobs");
  const jobs = jobsText === undefined ? availableParallelism() : Number(jobsText);
  if (!Number.isInteger(jobs) || jobs < 1 || jobs > 256) throw new UsageError(`invalid --jobs: "${jobsText}" (a whole number of worker threads from 1 to 256)`);
  const modelId = args.values.get("model") ?? DEFAULT_MODEL;
  const rows = jobs === 1 ? runInline(files, modelId, args) : await runPool(files, modelId, args, Math.min(jobs, files.length));
  const content = /\.json$/i.test(out) ? `${JSON.stringify(rows, null, 2)}\n` : batchCsv(rows);
  writeOutputFile(out, content, files);
  const failed = rows.filter((r) => r.status === "error").length;
  const notConverged = rows.filter((r) => r.status === "not-converged").length;
  const summary = `${rows.length} file${rows.length === 1 ? "" : "s"}: ${rows.length - failed - notConverged} fitted, ${notConverged} did not converge, ${failed} could not be read or fitted; results in ${out}`;
  return { stdout: "", exitCode: failed + notConverged > 0 ? 1 : 0, stderr: [summary] };
}

function runInline(files: readonly string[], modelId: string, args: ParsedArgs): BatchRow[] {
  const progress = progressBar(files.length);
  return files.map((file) => {
    const row = batchRow(file, modelId, args);
    progress(row);
    return row;
  });
}

function runPool(files: readonly string[], modelId: string, args: ParsedArgs, jobs: number): Promise<BatchRow[]> {
  const rows: BatchRow[] = new Array(files.length);
  const progress = progressBar(files.length);
  let next = 0;
  let done = 0;
  return new Promise((resolve, reject) => {
    const workers: Worker[] = [];
    const finish = (error?: unknown): void => {
      for (const w of workers) void w.terminate();
      if (error) reject(error);
      else resolve(rows);
    };
    const feed = (worker: Worker): void => {
      if (next < files.length) {
        worker.postMessage({ index: next, path: files[next] });
        next++;
      } else worker.postMessage(null);
    };
    for (let j = 0; j < jobs; j++) {
      const worker = new Worker(new URL("../batchWorker.js", import.meta.url), { workerData: { modelId, args } });
      workers.push(worker);
      worker.on("message", ({ index, row }: { index: number; row: BatchRow }) => {
        rows[index] = row;
        done++;
        progress(row);
        if (done === files.length) finish();
        else feed(worker);
      });
      worker.on("error", (error) => finish(error));
      feed(worker);
    }
  });
}

/** A progress bar on stderr, only when stderr is a terminal. */
function progressBar(total: number): (row: BatchRow) => void {
  if (!process.stderr.isTTY) return () => {};
  let done = 0;
  let failed = 0;
  return (row) => {
    done++;
    if (row.status !== "ok") failed++;
    const width = 30;
    const filled = Math.round((done / total) * width);
    process.stderr.write(`\r[${"#".repeat(filled)}${".".repeat(width - filled)}] ${done}/${total} files, ${failed} not fitted${done === total ? "\n" : ""}`);
  };
}
