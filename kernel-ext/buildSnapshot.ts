/**
 * `node buildSnapshot.js JOB_FILE`: builds the kernel's start-up snapshot for a SnapshotJob
 * (see startSnapshot.ts), started detached by a kernel. Builds into a temp file, checks that
 * Node starts from it and finds the expected state (`launch.js --check-snapshot KEY`), then
 * renames it into place and writes its description file (both atomically: temp file + rename),
 * and prunes the cache folder. A failure is recorded in the description file, so kernels do not
 * retry it at every start; nothing here can affect a running kernel.
 */
import { spawnSync } from "node:child_process";
import { readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { pruneCache } from "./codeCache.js";
import { buildKernelSnapshot } from "./snapshotEntry.js";
import { blobHead, snapshotFiles, snapshotScripts, takeBuildLock, type SnapshotJob, type SnapshotMeta } from "./startSnapshot.js";

/** Longest a build or its check may take before it counts as failed, ms. */
const BUILD_TIMEOUT_MS = 180_000;

function writeAtomic(file: string, text: string): void {
  const temp = `${file}.${process.pid}.tmp`;
  try {
    writeFileSync(temp, text);
    renameSync(temp, file);
  } finally {
    rmSync(temp, { force: true });
  }
}

/** Builds and checks the snapshot of `job`; returns the description to write. */
function build(job: SnapshotJob, jobFile: string): SnapshotMeta {
  const scripts = snapshotScripts();
  const meta: SnapshotMeta = { format: job.format, key: job.key, typescriptPath: job.typescriptPath, nodeVersion: process.version, blobBytes: 0, files: job.files.length };
  const temp = `${job.blob}.${process.pid}.tmp`;
  const entry = job.blob.replace(/\.blob$/, ".entry.js");
  try {
    writeFileSync(entry, `(${buildKernelSnapshot.toString()})(require, ${JSON.stringify(jobFile)});\n`);
    const made = spawnSync(process.execPath, ["--snapshot-blob", temp, "--build-snapshot", entry], { encoding: "utf8", timeout: BUILD_TIMEOUT_MS, stdio: ["ignore", "ignore", "pipe"] });
    if (made.status !== 0) return { ...meta, failed: `building exited with ${made.status ?? made.signal}: ${(made.stderr ?? "").trim().split("\n").slice(-3).join(" ")}` };
    // In a folder other than the build's (this process's), so a working directory remembered
    // by the snapshot would show.
    const check = spawnSync(process.execPath, ["--snapshot-blob", temp, scripts.launcher, "--check-snapshot", job.key], {
      encoding: "utf8", timeout: BUILD_TIMEOUT_MS, stdio: ["ignore", "pipe", "ignore"], cwd: path.dirname(job.typescriptPath),
    });
    const answer = (check.stdout ?? "").trim();
    if (check.status !== 0 || !answer.startsWith(`ok ${job.key} `)) return { ...meta, failed: `check of the built snapshot answered ${JSON.stringify(answer)} (exit ${check.status ?? check.signal})` };
    const blobBytes = statSync(temp).size;
    const head = blobHead(temp);
    renameSync(temp, job.blob);
    return { ...meta, blobBytes, head, files: Number(answer.split(" ")[2]) };
  } finally {
    rmSync(temp, { force: true });
    rmSync(entry, { force: true });
  }
}

function main(jobFile: string): void {
  const job = JSON.parse(readFileSync(jobFile, "utf8")) as SnapshotJob;
  const dir = path.dirname(job.blob);
  const { lock, prefix } = snapshotFiles(dir, job.typescriptPath, job.key);
  const release = takeBuildLock(lock);
  if (!release) return; // another kernel is building it
  try {
    const meta = build(job, jobFile);
    writeAtomic(job.meta, JSON.stringify(meta, null, 2) + "\n");
    if (!meta.failed) pruneCache(dir, prefix, [path.basename(job.blob), path.basename(job.meta), path.basename(lock), path.basename(jobFile)]);
  } finally {
    release();
  }
}

const jobFile = process.argv[2];
if (jobFile) {
  try {
    main(jobFile);
  } catch {
    // a cache that cannot be written only means the kernel starts without a snapshot
  } finally {
    rmSync(jobFile, { force: true });
  }
}
