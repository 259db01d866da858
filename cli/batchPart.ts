/**
 * Part files of a batch: JSON Lines, written while the batch runs so that a crash loses at most
 * the rows in flight.
 *
 *   line 1      {"fringekitBatchPart": 1, "batch": BatchIdentity, "shard": {"index": I, "count": N}}
 *   then        {"row": K, ...BatchRow}      one per fitted input (K = position in the whole batch, 0-based)
 *   last line   {"done": true, "rows": R}     only in a finished part
 *
 * A running or crashed part is "<part>.partial" (rows appended as they come); a finished part
 * is written atomically under its final name and the .partial removed.
 */
import { createHash } from "node:crypto";
import { closeSync, existsSync, fsyncSync, ftruncateSync, lstatSync, openSync, readFileSync, unlinkSync, writeSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { DataError } from "../src/advanced.js";
import type { BatchInput, BatchRow } from "./batchRow.js";
import { writeOutputFile } from "./files.js";
import type { ParsedArgs } from "./parseArgs.js";

/** What makes two runs the same batch: inputs, options and fringekit version. */
export interface BatchIdentity {
  /** Short id (first 16 hex digits of the SHA-256 of the three fields below). */
  id: string;
  fringekit: string;
  /** Number of inputs of the whole batch (all shards). */
  inputs: number;
  /** SHA-256 of the ordered input list (one "path" or "path\tpage" per line). */
  inputsSha256: string;
  /** The options that change results, as given (model, fit settings, data options). */
  options: Record<string, string | string[] | true>;
}

/** Header line of a part file. */
export interface PartHeader {
  fringekitBatchPart: 1;
  batch: BatchIdentity;
  shard: { index: number; count: number };
}

/** A batch row as stored in a part file. */
export interface PartRow extends BatchRow {
  /** Position of the input in the whole batch (0-based). */
  row: number;
  /** Set when the row records a failed worker thread, so --resume tries the input again. */
  retry?: true;
}

/** Options that do not change any result and so are not part of a batch's identity. */
export const NOT_IDENTITY = new Set(["out", "jobs", "shard", "resume", "quiet", "list", "slurm-script", "tasks", "accept-doubtful"]);

/** The folder of the fringekit package that holds the running code (where its package.json is). */
export function packageRoot(): string | undefined {
  let folder = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 4; i++) {
    const candidate = join(folder, "package.json");
    if (existsSync(candidate)) {
      const json = JSON.parse(readFileSync(candidate, "utf8")) as { name?: string };
      if (json.name === "fringekit") return folder;
    }
    folder = dirname(folder);
  }
  return undefined;
}

/** The fringekit version of the running code (from the package's package.json). */
export function fringekitVersion(): string {
  const root = packageRoot();
  if (root === undefined) return "unknown";
  return (JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { version?: string }).version ?? "unknown";
}

/**
 * The identity of a batch.
 * @param inputs all inputs in order
 * @param args   the parsed command line
 */
export function batchIdentity(inputs: readonly BatchInput[], args: ParsedArgs): BatchIdentity {
  const options: BatchIdentity["options"] = {};
  const names = [...args.values.keys(), ...args.lists.keys(), ...args.flags].filter((n) => !NOT_IDENTITY.has(n)).sort();
  for (const name of names) options[name] = args.values.get(name) ?? args.lists.get(name) ?? true;
  const list = inputs.map((i) => (i.page === undefined ? i.path : `${i.path}\t${i.page}`)).join("\n");
  const inputsSha256 = createHash("sha256").update(list).digest("hex");
  const fringekit = fringekitVersion();
  const id = createHash("sha256").update(JSON.stringify([fringekit, inputsSha256, options])).digest("hex").slice(0, 16);
  return { id, fringekit, inputs: inputs.length, inputsSha256, options };
}

/**
 * What differs between two identities, in words ("" when they are the same batch).
 * @param a one identity
 * @param b the other
 */
export function identityDifference(a: BatchIdentity, b: BatchIdentity): string {
  const differences: string[] = [];
  if (a.fringekit !== b.fringekit) differences.push(`fringekit version ${a.fringekit} vs ${b.fringekit}`);
  if (a.inputsSha256 !== b.inputsSha256) differences.push(a.inputs !== b.inputs ? `inputs (${a.inputs} vs ${b.inputs} files)` : `inputs (same count ${a.inputs}, different files or order)`);
  if (JSON.stringify(a.options) !== JSON.stringify(b.options)) differences.push(`options (${optionsText(a.options)} vs ${optionsText(b.options)})`);
  return differences.join(", ");
}

function optionsText(options: BatchIdentity["options"]): string {
  const words = Object.entries(options).flatMap(([name, value]) => (value === true ? [`--${name}`] : (Array.isArray(value) ? value : [value]).map((v) => `--${name} ${v}`)));
  return words.length === 0 ? "none" : words.join(" ");
}

/**
 * File name of a shard's part: "results.csv" → "results.part-03-of-16.jsonl" (zero-padded to
 * the width of N, so the parts sort in shard order).
 * @param out   the --out path of the batch
 * @param shard shard number and count
 */
export function partPath(out: string, shard: { index: number; count: number }): string {
  const width = String(shard.count).length;
  const base = out.replace(/\.(csv|json)$/i, "");
  return `${base}.part-${String(shard.index).padStart(width, "0")}-of-${shard.count}.jsonl`;
}

/** What a part file holds. */
export interface PartContent {
  path: string;
  header: PartHeader;
  rows: PartRow[];
  /** Whether the part ends with its "done" line. */
  complete: boolean;
  /** Byte length of the complete lines (a torn last line of a crashed run is left out). */
  goodLength: number;
}

/**
 * Reads a part file (finished or .partial). A torn last line (a crash while writing) is ignored.
 * @param path the part file
 */
export function readPart(path: string): PartContent {
  let bytes: Buffer;
  try {
    bytes = readFileSync(path);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError(path, code === "ENOENT" ? "no such part file" : `the part file cannot be read (${code ?? String(error)})`, "give the part files written by fringekit batch --shard");
  }
  const text = bytes.toString("utf8");
  const lines = text.split("\n");
  let header: PartHeader | undefined;
  const rows: PartRow[] = [];
  let complete = false;
  let offset = 0;
  let goodLength = 0;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!;
    const terminated = i < lines.length - 1;
    offset += Buffer.byteLength(line) + (terminated ? 1 : 0);
    if (line === "") continue;
    let value: unknown;
    try {
      value = JSON.parse(line);
    } catch {
      if (!terminated && header) break; // torn last line of a crashed run
      throw new DataError(path, `line ${i + 1} is not JSON`, "give the part files written by fringekit batch --shard, unchanged");
    }
    if (i === 0) {
      header = checkHeader(value, path);
    } else if (isDone(value)) {
      complete = true;
    } else if (isRow(value)) {
      rows.push(value);
    } else {
      throw new DataError(path, `line ${i + 1} is not a batch row`, "give the part files written by fringekit batch --shard, unchanged");
    }
    if (terminated) goodLength = offset;
  }
  if (!header) throw new DataError(path, "the part file is empty", "run the shard again (fringekit batch ... --shard I/N --resume)");
  return { path, header, rows, complete, goodLength };
}

function checkHeader(value: unknown, path: string): PartHeader {
  const h = value as Partial<PartHeader> | null;
  if (!h || h.fringekitBatchPart !== 1 || typeof h.batch?.id !== "string" || typeof h.batch.inputs !== "number" || typeof h.shard?.index !== "number" || typeof h.shard.count !== "number") {
    throw new DataError(path, "not a fringekit batch part file (its first line is not a part header)", "give the .jsonl part files written by fringekit batch --shard");
  }
  return h as PartHeader;
}

function isDone(value: unknown): boolean {
  return typeof value === "object" && value !== null && (value as { done?: unknown }).done === true;
}

function isRow(value: unknown): value is PartRow {
  const r = value as Partial<PartRow> | null;
  return !!r && Number.isInteger(r.row) && typeof r.file === "string" && (r.status === "ok" || r.status === "doubtful" || r.status === "not-converged" || r.status === "error") && typeof r.message === "string";
}

/**
 * Appends rows to "<part>.partial" as they come, then writes the finished part atomically.
 */
export class PartWriter {
  private fd: number;
  private readonly partial: string;
  private count = 0;
  private lines: string[] = [];

  /**
   * Opens the .partial file: continued after its last complete line when resuming, else created
   * (refusing to overwrite an unfinished part, which holds work).
   * @param path    the final part path
   * @param header  the header line
   * @param resumed the content of an existing .partial to continue, if any
   */
  constructor(readonly path: string, header: PartHeader, resumed?: PartContent) {
    this.partial = `${path}.partial`;
    try {
      if (resumed) {
        const stat = lstatSync(this.partial);
        if (!stat.isFile()) throw new DataError(this.partial, "not a regular file", "remove it and run the batch again");
        this.fd = openSync(this.partial, "r+");
        ftruncateSync(this.fd, resumed.goodLength);
        const text = readFileSync(this.partial, "utf8");
        this.lines = text.split("\n").filter((l) => l !== "");
        this.fd = reopenForAppend(this.fd, this.partial);
        this.count = resumed.rows.length;
      } else {
        this.fd = openSync(this.partial, "wx");
        this.append(JSON.stringify(header));
      }
    } catch (error) {
      if (error instanceof DataError) throw error;
      const code = (error as NodeJS.ErrnoException).code;
      throw new DataError(this.partial, code === "EEXIST" ? "an unfinished part of an earlier run is there" : `cannot be written (${code ?? String(error)})`, code === "EEXIST" ? "add --resume to continue it, or delete it to start again" : "check that the folder exists and is writable");
    }
  }

  /** Appends one row (one write call, so a crash leaves at most a torn last line). */
  addRow(row: PartRow): void {
    this.append(JSON.stringify(row));
    this.count++;
  }

  /** Writes the finished part atomically under its final name and removes the .partial. */
  finish(): void {
    this.lines.push(JSON.stringify({ done: true, rows: this.count }));
    fsyncSync(this.fd);
    closeSync(this.fd);
    writeOutputFile(this.path, `${this.lines.join("\n")}\n`);
    unlinkSync(this.partial);
  }

  /** Closes the .partial without finishing (the rows so far stay for --resume). */
  close(): void {
    try { closeSync(this.fd); } catch { /* already closed */ }
  }

  /** Removes the .partial (a one-machine batch whose results file has been written). */
  discard(): void {
    this.close();
    try { unlinkSync(this.partial); } catch { /* already gone */ }
  }

  private append(line: string): void {
    this.lines.push(line);
    writeSync(this.fd, `${line}\n`);
  }
}

function reopenForAppend(fd: number, path: string): number {
  closeSync(fd);
  return openSync(path, "a");
}
