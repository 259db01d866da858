/**
 * `fringekit batch ... --slurm-script job.sh --tasks N`: a commented sbatch script for an array
 * job, written for a person to read, edit and submit. Each array task i runs
 * `fringekit batch --list LIST --shard i/N --resume`, so a task that failed or hit its time
 * limit is re-run on its own with `sbatch --array=i job.sh` and continues where it stopped.
 */
import { basename, dirname, join } from "node:path";
import type { ParsedArgs } from "./parseArgs.js";

/** What the script needs. */
export interface SlurmScriptPlan {
  /** The input list file the script reads (written beside the script). */
  listPath: string;
  inputs: number;
  tasks: number;
  /** Worker threads per task (= CPUs per task). */
  jobs: number;
  /** The --out of the batch: parts are written beside it. */
  out: string;
  /** Folder for the Slurm log files. */
  logs: string;
  /** The folder the job runs in (relative paths of the list are relative to it). */
  workdir: string;
  /** The command that runs fringekit on the cluster nodes. */
  command: string[];
  version: string;
  /** Options that change results (model, fit settings, data options). */
  args: ParsedArgs;
  /** Option names that are not passed on (inputs, sharding, output, script generation). */
  omit: ReadonlySet<string>;
}

/** Memory asked per task: the main thread plus each worker thread (MB). A B1-like fit needs far less; frames need more. */
export function memoryPerTaskMb(jobs: number): number {
  return 512 + 256 * jobs;
}

/**
 * The text of the sbatch script.
 * @param plan see SlurmScriptPlan
 */
export function slurmScript(plan: SlurmScriptPlan): string {
  const perTask = Math.ceil(plan.inputs / plan.tasks);
  const options = optionWords(plan.args, plan.omit);
  const partGlob = `${plan.out.replace(/\.(csv|json)$/i, "")}.part-*.jsonl`;
  const merged = join(dirname(plan.out), `merged${/\.json$/i.test(plan.out) ? ".json" : ".csv"}`);
  const lines = [
    "#!/bin/bash",
    `# fringekit batch as a Slurm array job (written by fringekit ${plan.version}; edit freely).`,
    `# ${plan.inputs} inputs listed in ${plan.listPath}, split into ${plan.tasks} shards of about ${perTask}`,
    `# (input k, counted from 0, goes to shard k mod ${plan.tasks} + 1; array task i runs shard i).`,
    "#",
    "# Submit:   sbatch " + shellWord(basename(plan.listPath).replace(/\.inputs\.txt$/, ".sh")),
    "# Watch:    squeue --me            (tasks still queued or running; sacct -j JOBID for finished ones)",
    `# Logs:     ${plan.logs}/fringekit-JOBID_TASK.log (progress line every few seconds)`,
    `# Merge:    fringekit merge ${partGlob} --out ${merged}`,
    "#           (checks that every shard is there and finished; names the missing ones)",
    "# Re-run shard i only (after a failure or a time limit): sbatch --array=i this-script",
    "#           (--resume below keeps the rows it already finished).",
    "#",
    "# The values below are starting points; your site's rules (partition, account, limits) win.",
    `#SBATCH --job-name=fringekit-batch`,
    `#SBATCH --array=1-${plan.tasks}`,
    `#SBATCH --cpus-per-task=${plan.jobs}        # worker threads per task (fringekit --jobs)`,
    `#SBATCH --mem=${memoryPerTaskMb(plan.jobs)}M             # per task: ~512 MB for the main thread + 256 MB per worker; raise for large frames`,
    "#SBATCH --time=01:00:00          # per task; measure a few hundred inputs first: time = inputs per task / rate (the log prints the rate)",
    `#SBATCH --output=${plan.logs}/fringekit-%A_%a.log`,
    `#SBATCH --chdir=${plan.workdir}`,
    "#SBATCH --ntasks=1",
    "##SBATCH --partition=NAME        # remove one # to choose a partition",
    "##SBATCH --account=NAME",
    "",
    "set -euo pipefail",
    `# fringekit itself (Node.js ${process.versions.node.split(".")[0]} or later must be on the nodes' PATH, or give its full path here).`,
    `FRINGEKIT=(${plan.command.map(shellWord).join(" ")})`,
    "",
    `"\${FRINGEKIT[@]}" batch --list ${shellWord(plan.listPath)} \\`,
    ...(options.length > 0 ? [`  ${options.map(shellWord).join(" ")} \\`] : []),
    `  --shard "\${SLURM_ARRAY_TASK_ID}/${plan.tasks}" --jobs "\${SLURM_CPUS_PER_TASK:-1}" --resume \\`,
    `  --out ${shellWord(plan.out)}`,
    "",
  ];
  return lines.join("\n");
}

/** The command line words of the options that change results, as --name=value. */
export function optionWords(args: ParsedArgs, omit: ReadonlySet<string>): string[] {
  const words: string[] = [];
  for (const [name, value] of args.values) if (!omit.has(name)) words.push(`--${name}=${value}`);
  for (const [name, values] of args.lists) if (!omit.has(name)) for (const value of values) words.push(`--${name}=${value}`);
  for (const name of args.flags) if (!omit.has(name)) words.push(`--${name}`);
  return words;
}

/** A word quoted for bash when needed ('…' with ' written as '\''). */
export function shellWord(word: string): string {
  return /^[A-Za-z0-9_./:=@%+,-]+$/.test(word) ? word : `'${word.replace(/'/g, `'\\''`)}'`;
}

