/**
 * Sharding without a coordinator: shard I of N takes every input whose position k (0 = first)
 * satisfies k mod N = I − 1. Every task computes its own part from the same ordered input list,
 * so nothing is shared but the list; shard sizes differ by at most one input, and because the
 * inputs are dealt out in turn, a trend along the list (bigger frames at the end of a run)
 * is spread over all shards.
 */
import { UsageError } from "./usageError.js";

/** Shard number (1 … count) and shard count. */
export interface Shard {
  index: number;
  count: number;
  /** Where the shard came from, for messages. */
  from: "--shard" | "Slurm array";
}

/** Largest shard count accepted (a Slurm array is usually limited far below this). */
export const MAX_SHARDS = 1_000_000;

/**
 * Parses "I/N" (shard I of N, 1-based).
 * @param text the value of --shard
 */
export function parseShard(text: string): Shard {
  const match = /^(\d+)\/(\d+)$/.exec(text.trim());
  const index = Number(match?.[1]);
  const count = Number(match?.[2]);
  if (!match || !(count >= 1) || count > MAX_SHARDS || !(index >= 1) || index > count) {
    throw new UsageError(`invalid --shard: "${text}" (I/N with 1 ≤ I ≤ N, e.g. --shard 3/16 for the third of 16 parts)`);
  }
  return { index, count, from: "--shard" };
}

/**
 * The shard of a Slurm array task, from SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_MIN,
 * SLURM_ARRAY_TASK_COUNT (and SLURM_ARRAY_TASK_STEP for arrays such as 0-30:2):
 * shard = (ID − MIN) / STEP + 1 of COUNT. Undefined outside an array job.
 * @param env the environment
 */
export function shardFromSlurm(env: NodeJS.ProcessEnv): Shard | undefined {
  const id = env["SLURM_ARRAY_TASK_ID"];
  if (id === undefined || id === "") return undefined;
  const min = env["SLURM_ARRAY_TASK_MIN"], count = env["SLURM_ARRAY_TASK_COUNT"], step = env["SLURM_ARRAY_TASK_STEP"] ?? "1";
  const numbers = [id, min, count, step].map((v) => (v !== undefined && /^\d+$/.test(v) ? Number(v) : NaN));
  const [n, lo, total, stride] = numbers as [number, number, number, number];
  if (numbers.some((v) => Number.isNaN(v)) || stride < 1 || (n - lo) % stride !== 0) {
    throw new UsageError(`the Slurm array variables do not describe a shard (SLURM_ARRAY_TASK_ID=${id}, SLURM_ARRAY_TASK_MIN=${min ?? "unset"}, SLURM_ARRAY_TASK_COUNT=${count ?? "unset"}, SLURM_ARRAY_TASK_STEP=${step}); give --shard I/N explicitly`);
  }
  const index = (n - lo) / stride + 1;
  if (index > total || total < 1) {
    throw new UsageError(`the Slurm array task ${n} is not one of ${total} evenly spaced tasks from ${lo} (an array such as --array=1,5,9 or a resubmission of some tasks); give --shard I/N explicitly, e.g. --shard "$SLURM_ARRAY_TASK_ID/N"`);
  }
  return { index, count: total, from: "Slurm array" };
}

/**
 * Positions (0-based, ascending) of the inputs that belong to a shard.
 * @param total number of inputs of the whole batch
 * @param shard the shard
 */
export function shardPositions(total: number, shard: Pick<Shard, "index" | "count">): number[] {
  const positions: number[] = [];
  for (let k = shard.index - 1; k < total; k += shard.count) positions.push(k);
  return positions;
}
