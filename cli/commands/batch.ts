/**
 * `fringekit batch FILES|FOLDERS... [--list FILE] [--model ID] [--jobs N] [--shard I/N] [--resume]
 * --out results.csv|.json`, and `--slurm-script job.sh --tasks N` to write an array-job script.
 *
 * Rows are appended to a part file as they come (crash-safe, see batchPart.ts). Without --shard
 * (and outside a Slurm array) the batch is the whole job: the results file is written in input
 * order at the end and the part file removed. With a shard, the finished part file is the output;
 * `fringekit merge` joins the parts.
 */
import { availableParallelism } from "node:os";
import { chmodSync, existsSync, mkdirSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { collectInputs, inputLabel } from "../batchInputs.js";
import { NOT_IDENTITY, PartWriter, batchIdentity, fringekitVersion, identityDifference, packageRoot, partPath, readPart, type PartContent, type PartHeader, type PartRow } from "../batchPart.js";
import { runPool, type PoolStats } from "../batchPool.js";
import { progressReporter } from "../batchProgress.js";
import { batchCsv, batchRow, type BatchInput, type BatchRow } from "../batchRow.js";
import { parseShard, shardFromSlurm, shardPositions, MAX_SHARDS, type Shard } from "../batchShard.js";
import { slurmScript } from "../batchSlurm.js";
import { DOUBTFUL_EXIT } from "../doubtful.js";
import { checkOutputPath, writeOutputFile } from "../files.js";
import { parseArgs, type ParsedArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";
import { DataError } from "../../src/advanced.js";
import { DEFAULT_MODEL, FIT_OPTIONS } from "./fit.js";

/** Options of the batch command. */
export const BATCH_OPTIONS = (() => {
  const { json: _json, out: _out, ...fitOptions } = FIT_OPTIONS;
  return {
    ...fitOptions,
    model: { kind: "value" },
    jobs: { kind: "value" },
    out: { kind: "value" },
    list: { kind: "list" },
    shard: { kind: "value" },
    resume: { kind: "flag" },
    quiet: { kind: "flag" },
    "slurm-script": { kind: "value" },
    tasks: { kind: "value" },
  } as const;
})();

/** Runs the batch command. */
export async function batchCommand(words: readonly string[]): Promise<CommandOutput> {
  const args = parseArgs(words, BATCH_OPTIONS, "batch");
  const lists = args.lists.get("list") ?? [];
  if (args.positionals.length === 0 && lists.length === 0) throw new UsageError("batch needs at least one data file or folder (or --list FILE with one path per line)");
  const out = args.values.get("out");
  if (out === undefined || !/\.(csv|json)$/i.test(out)) throw new UsageError("batch needs --out results.csv or --out results.json");
  const eachPage = args.values.get("page") === "each";
  const jobs = jobCount(args);
  const inputs = collectInputs(args.positionals, lists, eachPage);
  const identity = batchIdentity(inputs, args);
  // The fit settings and data options go to the workers; "--page each" was turned into one input per page.
  const fitArgs: ParsedArgs = { ...args, values: new Map([...args.values].filter(([name, value]) => !(name === "page" && value === "each"))) };

  const script = args.values.get("slurm-script");
  if (script !== undefined) return writeSlurmScript(script, args, inputs, out, jobs);
  if (args.values.has("tasks")) throw new UsageError("--tasks goes with --slurm-script job.sh (the number of array tasks)");

  const shardText = args.values.get("shard");
  const shard = shardText !== undefined ? parseShard(shardText) : shardFromSlurm(process.env);
  const partShard = shard ?? { index: 1, count: 1 };
  const part = partPath(out, partShard);
  checkOutputPath(shard ? part : out, inputs.map((i) => i.path));
  const header: PartHeader = { fringekitBatchPart: 1, batch: identity, shard: { index: partShard.index, count: partShard.count } };
  const positions = shardPositions(inputs.length, partShard);

  const previous = args.flags.has("resume") ? resumable(part, header) : undefined;
  if (previous?.complete) {
    const rows = latestRows(previous.rows);
    return summary(rows, [`shard ${partShard.index}/${partShard.count} was already finished in ${part}; nothing to do`]);
  }
  const rows = new Map<number, BatchRow>();
  if (previous) for (const [position, row] of latestRowsByPosition(previous.rows)) if (!row.retry) rows.set(position, stripPart(row));
  const todo = positions.filter((k) => !rows.has(k));
  const writer = new PartWriter(part, header, previous);
  const progress = progressReporter(todo.length, eachPage ? "frames" : "inputs", process.stderr, args.flags.has("quiet"));
  const record = (position: number, row: BatchRow, retry = false): void => {
    rows.set(position, row);
    writer.addRow({ row: position, ...row, ...(retry ? { retry: true as const } : {}) });
    progress.step(row.status === "ok");
  };
  const modelId = args.values.get("model") ?? DEFAULT_MODEL;
  let stats: PoolStats | undefined;
  try {
    if (jobs === 1 || todo.length <= 1) {
      for (const position of todo) record(position, await batchRow(inputs[position]!, modelId, fitArgs));
    } else {
      stats = await runPool<BatchInput, BatchRow>({
        workerUrl: new URL("../batchWorker.js", import.meta.url),
        workerData: { modelId, args: fitArgs },
        jobs,
        tasks: todo.map((position) => ({ position, input: inputs[position]! })),
        onResult: (position, row) => record(position, row, row.status === "error" && row.message.startsWith(WORKER_FAILED)),
        failure: ({ input }, reason) => ({ file: input.path, ...(input.page !== undefined ? { page: input.page } : {}), status: "error", message: `${WORKER_FAILED} ${inputLabel(input)}: ${reason}`, fit: null }),
      });
    }
  } catch (error) {
    writer.close();
    progress.end();
    throw new DataError(part, `the batch stopped (${error instanceof Error ? error.message : String(error)}); the rows finished so far are kept`, "fix the cause and run the same command with --resume");
  }
  progress.end();
  const ordered = positions.map((k) => rows.get(k)!);
  const notes: string[] = [];
  if (previous) notes.push(`resumed: ${positions.length - todo.length} rows of the earlier run kept, ${todo.length} fitted now`);
  if (stats && stats.workerStartMs.length > 0) notes.push(`${stats.workerStartMs.length} worker threads started in ${seconds(Math.min(...stats.workerStartMs))}–${seconds(Math.max(...stats.workerStartMs))}${stats.workerFailures > 0 ? `; ${stats.workerFailures} failed while fitting (their inputs are error rows; --resume tries them again)` : ""}`);
  if (shard) {
    writer.finish();
    notes.push(`shard ${shard.index}/${shard.count}${shard.from === "Slurm array" ? " (from the Slurm array task)" : ""}: ${positions.length} of ${inputs.length} inputs; part written to ${part}; join the parts with fringekit merge`);
    return summary(ordered, notes, undefined, args.flags.has("accept-doubtful"));
  }
  writeOutputFile(out, /\.json$/i.test(out) ? `${JSON.stringify(ordered, null, 2)}\n` : batchCsv(ordered), inputs.map((i) => i.path));
  writer.discard();
  notes.push(`results in ${out}`);
  return summary(ordered, notes, undefined, args.flags.has("accept-doubtful"));
}

/** Start of the message of a row whose worker thread failed (--resume tries it again). */
const WORKER_FAILED = "the worker thread stopped while fitting";

/**
 * The exit code and stderr summary of rows ("N inputs: A fitted, D doubtful, B did not converge,
 * C could not be read or fitted"). Exit 1 when any input failed or did not converge; else 3
 * (DOUBTFUL_EXIT, as `fringekit fit`) when a converged fit is doubtful, unless `accepted`
 * (--accept-doubtful); else 0.
 * @param rows     the rows
 * @param notes    extra lines (the last one ends the first line)
 * @param noun     what a row is ("file", or "frame" for pages of stacks)
 * @param accepted whether doubtful fits are accepted (exit 0)
 */
export function summary(rows: readonly BatchRow[], notes: readonly string[], noun = rows.some((r) => r.page !== undefined) ? "frame" : "file", accepted = false): CommandOutput {
  const failed = rows.filter((r) => r.status === "error").length;
  const notConverged = rows.filter((r) => r.status === "not-converged").length;
  const doubtful = rows.filter((r) => r.status === "doubtful").length;
  const head = `${rows.length} ${noun}${rows.length === 1 ? "" : "s"}: ${rows.length - failed - notConverged - doubtful} fitted, ${doubtful > 0 ? `${doubtful} doubtful (the model does not describe the data, or no fringe; see the message column), ` : ""}${notConverged} did not converge, ${failed} could not be read or fitted`;
  const exitCode = failed + notConverged > 0 ? 1 : doubtful > 0 && !accepted ? DOUBTFUL_EXIT : 0;
  return { stdout: "", exitCode, stderr: [`${head}${notes.length > 0 ? `; ${notes[notes.length - 1]}` : ""}`, ...notes.slice(0, -1)] };
}

function seconds(ms: number): string {
  return `${(ms / 1000).toFixed(2)} s`;
}

/** Worker threads: --jobs, else the CPUs Slurm gave the task, else the machine's. */
function jobCount(args: ParsedArgs): number {
  const text = args.values.get("jobs") ?? process.env["SLURM_CPUS_PER_TASK"];
  const jobs = text === undefined ? availableParallelism() : Number(text);
  if (!Number.isInteger(jobs) || jobs < 1 || jobs > 256) throw new UsageError(`invalid --jobs: "${text}" (a whole number of worker threads from 1 to 256)`);
  return jobs;
}

/** The existing part (finished, else unfinished) of the same batch and shard, to continue. */
function resumable(part: string, header: PartHeader): PartContent | undefined {
  for (const path of [part, `${part}.partial`]) {
    if (!existsSync(path)) continue;
    const content = readPart(path);
    const difference = identityDifference(content.header.batch, header.batch);
    if (difference) throw new DataError(path, `cannot resume: written by a different batch (${difference})`, "run with the same inputs and options, or delete it to start again");
    if (content.header.shard.index !== header.shard.index || content.header.shard.count !== header.shard.count) throw new DataError(path, `cannot resume: it is shard ${content.header.shard.index}/${content.header.shard.count}`, "delete it to start again");
    if (path === part && !content.complete) throw new DataError(path, "a part without its closing line", "delete it and run the shard again");
    return content;
  }
  return undefined;
}

function latestRowsByPosition(rows: readonly PartRow[]): Map<number, PartRow> {
  const latest = new Map<number, PartRow>();
  for (const row of rows) latest.set(row.row, row);
  return latest;
}

function latestRows(rows: readonly PartRow[]): BatchRow[] {
  return [...latestRowsByPosition(rows)].sort((a, b) => a[0] - b[0]).map(([, row]) => stripPart(row));
}

/** A part row without its bookkeeping fields, as a results file holds it. */
export function stripPart(row: PartRow): BatchRow {
  const { row: _position, retry: _retry, ...rest } = row;
  return rest;
}

function writeSlurmScript(script: string, args: ParsedArgs, inputs: readonly BatchInput[], out: string, jobs: number): CommandOutput {
  if (!/\.sh$/i.test(script)) throw new UsageError(`invalid --slurm-script: "${script}" (a file name ending in .sh)`);
  const tasksText = args.values.get("tasks");
  const tasks = Number(tasksText);
  if (tasksText === undefined || !/^\d+$/.test(tasksText) || tasks < 1 || tasks > MAX_SHARDS) throw new UsageError(`--slurm-script needs --tasks N (a whole number of array tasks from 1, e.g. --tasks 16); got ${tasksText === undefined ? "none" : `"${tasksText}"`}`);
  if (args.values.has("shard")) throw new UsageError("--shard is set by the job script for each array task; leave it out with --slurm-script");
  checkOutputPath(script, inputs.map((i) => i.path));
  const listPath = script.replace(/\.sh$/i, ".inputs.txt");
  const outFolder = dirname(out);
  const logs = join(outFolder, "logs");
  mkdirSync(logs, { recursive: true });
  // One path per line: pages of stacks are found again by --page each in every task.
  const paths = [...new Set(inputs.map((i) => i.path))];
  if (paths.some((p) => /[\r\n]/.test(p))) throw new DataError(script, "an input path holds a line break and cannot go in a list file", "rename that file");
  writeOutputFile(listPath, `${paths.join("\n")}\n`, inputs.map((i) => i.path));
  const root = packageRoot();
  const command = root === undefined ? ["fringekit"] : [process.execPath, join(root, "bin", "fringekit.js")];
  const omit = new Set([...NOT_IDENTITY]);
  const text = slurmScript({ listPath: relativeOrAbsolute(listPath), inputs: inputs.length, tasks, jobs, out, logs, workdir: resolve("."), command, version: fringekitVersion(), args, omit });
  writeOutputFile(script, text, inputs.map((i) => i.path));
  chmodSync(script, 0o755);
  const partsWord = `${out.replace(/\.(csv|json)$/i, "")}.part-*.jsonl`;
  return {
    stdout: "",
    exitCode: 0,
    stderr: [
      `wrote ${script} (${tasks} array tasks × ${jobs} CPUs over ${inputs.length} inputs) and ${listPath}`,
      `submit: sbatch ${script}    watch: squeue --me    then: fringekit merge ${partsWord} --out ${join(outFolder, /\.json$/i.test(out) ? "merged.json" : "merged.csv")}`,
    ],
  };
}

function relativeOrAbsolute(path: string): string {
  const rel = relative(".", path);
  return rel.startsWith("..") ? resolve(path) : rel;
}
