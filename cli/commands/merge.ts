/**
 * `fringekit merge PARTS... --out results.csv|results.json`: joins the part files of a sharded
 * batch into exactly the results file the one-machine batch writes (rows in input order).
 * Refuses parts of different batches (inputs, options or fringekit version) and names the
 * shards that are missing or unfinished, with the command that re-runs them.
 */
import { readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { DataError } from "../../src/advanced.js";
import { identityDifference, readPart, type PartContent } from "../batchPart.js";
import { batchCsv, type BatchRow } from "../batchRow.js";
import { shardPositions } from "../batchShard.js";
import { checkOutputPath, writeOutputFile } from "../files.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";
import { stripPart, summary } from "./batch.js";

/** Runs the merge command. */
export function mergeCommand(words: readonly string[]): CommandOutput {
  const args = parseArgs(words, { out: { kind: "value" } }, "merge");
  const out = args.values.get("out");
  if (out === undefined || !/\.(csv|json)$/i.test(out)) throw new UsageError("merge needs --out results.csv or --out results.json");
  if (args.positionals.length === 0) throw new UsageError("merge needs the part files (e.g. fringekit merge parts/results.part-*.jsonl --out results.csv) or their folder");
  const paths = expandPartFolders(args.positionals);
  checkOutputPath(out, paths);
  const parts = paths.map(readPart);
  const first = parts[0]!;
  const { count } = first.header.shard;
  for (const part of parts.slice(1)) {
    const difference = identityDifference(first.header.batch, part.header.batch);
    if (difference) throw new DataError(part.path, `belongs to a different batch than ${first.path} (${difference})`, "merge only the parts of one batch run");
    if (part.header.shard.count !== count) throw new DataError(part.path, `is shard ${part.header.shard.index} of ${part.header.shard.count}, ${first.path} is one of ${count}`, "merge only the parts of one batch run");
  }
  const byShard = new Map<number, PartContent>();
  for (const part of parts) {
    const other = byShard.get(part.header.shard.index);
    // A finished part wins over the .partial of the same shard (both match a wide glob).
    if (other && other.complete === part.complete) throw new DataError(part.path, `shard ${part.header.shard.index} is given twice (also ${other.path})`, "give each part once");
    if (!other || part.complete) byShard.set(part.header.shard.index, part);
  }
  const missing: number[] = [];
  const unfinished: string[] = [];
  for (let shard = 1; shard <= count; shard++) {
    const part = byShard.get(shard);
    if (!part) missing.push(shard);
    else if (!part.complete) unfinished.push(`${shard} (${new Set(part.rows.map((r) => r.row)).size} of ${shardPositions(first.header.batch.inputs, { index: shard, count }).length} rows)`);
  }
  if (missing.length > 0 || unfinished.length > 0) {
    const problems = [
      ...(missing.length > 0 ? [`shard${missing.length === 1 ? "" : "s"} ${ranges(missing)} of ${count} missing (no part file given)`] : []),
      ...(unfinished.length > 0 ? [`shard${unfinished.length === 1 ? "" : "s"} ${unfinished.join(", ")} unfinished (the task crashed, was stopped or is still running)`] : []),
    ];
    const again = [...missing, ...unfinished.map((u) => Number(u.split(" ")[0]))].sort((a, b) => a - b);
    throw new DataError(out, `not written: ${problems.join("; ")}`, `re-run ${again.length === 1 ? "that shard" : "those shards"} (sbatch --array=${ranges(again).replace(/ /g, "")} job.sh, or fringekit batch ... --shard I/${count} --resume), then merge again`);
  }
  const total = first.header.batch.inputs;
  const rows: (BatchRow | undefined)[] = new Array(total);
  for (const part of byShard.values()) {
    const expected = new Set(shardPositions(total, part.header.shard));
    for (const row of part.rows) {
      if (!expected.has(row.row)) throw new DataError(part.path, `holds row ${row.row + 1}, which is not in shard ${part.header.shard.index}/${count}`, "give the part files written by fringekit batch, unchanged");
      rows[row.row] = stripPart(row); // a later row of the same input (a retry) wins
    }
  }
  const absent = rows.findIndex((r) => r === undefined);
  if (absent >= 0 || rows.length !== total) throw new DataError(byShard.get((absent % count) + 1)?.path ?? out, `row ${absent + 1} of ${total} is not in its finished part`, "run that shard again with --resume");
  const ordered = rows as BatchRow[];
  writeOutputFile(out, /\.json$/i.test(out) ? `${JSON.stringify(ordered, null, 2)}\n` : batchCsv(ordered), paths);
  return summary(ordered, [`${count} part${count === 1 ? "" : "s"} of batch ${first.header.batch.id} merged into ${out}`]);
}

/** Folders among the arguments are replaced by the .jsonl part files in them. */
function expandPartFolders(paths: readonly string[]): string[] {
  return paths.flatMap((path) => {
    let isFolder = false;
    try { isFolder = statSync(path).isDirectory(); } catch { return [path]; }
    if (!isFolder) return [path];
    const files = readdirSync(path).filter((n) => /\.part-\d+-of-\d+\.jsonl(\.partial)?$/.test(n)).sort().map((n) => join(path, n));
    if (files.length === 0) throw new DataError(path, "a folder with no part files (*.part-I-of-N.jsonl)", "give the part files or the folder fringekit batch --shard wrote them to");
    return files;
  });
}

/** [1,2,3,7,9,10] → "1-3, 7, 9-10". */
function ranges(numbers: readonly number[]): string {
  const out: string[] = [];
  for (let i = 0; i < numbers.length; i++) {
    let j = i;
    while (j + 1 < numbers.length && numbers[j + 1] === numbers[j]! + 1) j++;
    out.push(j > i ? `${numbers[i]}-${numbers[j]}` : String(numbers[i]));
    i = j;
  }
  return out.join(", ");
}
