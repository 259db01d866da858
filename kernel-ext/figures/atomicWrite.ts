/**
 * The project's one output writer. Policy (README, "Limits and security"):
 * - a missing path or a regular file is replaced atomically: the bytes go to a temporary file
 *   created exclusively (O_CREAT|O_EXCL, so a symlink planted at its name is never followed) with
 *   an unpredictable name in the target's folder, are flushed, and the file is renamed over the
 *   target; readers see the old file or the complete new one. The old file's permission bits
 *   are kept.
 * - a FIFO or a character device (`/dev/null`, `/dev/stdout`, a named pipe) is streamed to, as
 *   `cat > target` would: renaming over it would replace the device node by a regular file.
 * - a symlink is followed to the file it names (the link stays a link), then the rules above apply.
 * - anything else (a folder, a socket, a block device) is refused with a message naming the path.
 */
import { randomBytes } from "node:crypto";
import {
  chmodSync, closeSync, constants, fstatSync, fsyncSync, lstatSync, openSync, realpathSync, renameSync, statSync,
  unlinkSync, writeSync, type Stats,
} from "node:fs";
import { chmod, lstat, open, realpath, rename, stat, unlink } from "node:fs/promises";
import path from "node:path";
import { FringekitError } from "../../src/errors.js";

/**
 * A fresh temporary path for `target`: a hidden name in the target's folder with 16 random
 * bytes (128 bits) in it, so it cannot be guessed in advance.
 * @param target output path (absolute or relative)
 */
export function temporaryPathFor(target: string): string {
  const resolved = path.resolve(target);
  return path.join(path.dirname(resolved), `.${path.basename(resolved)}.${randomBytes(16).toString("hex")}.tmp`);
}

type Plan = { kind: "replace"; target: string; mode?: number } | { kind: "stream"; target: string };

/** Decides how to write `target` from the type of what is there (after following symlinks). */
function planFor(original: string, resolved: string, info: Stats | undefined): Plan {
  if (info === undefined || info.isFile()) return { kind: "replace", target: resolved, mode: info ? info.mode & 0o7777 : undefined };
  if (info.isFIFO() || info.isCharacterDevice()) return { kind: "stream", target: resolved };
  const what = info.isDirectory() ? "is a folder" : info.isSocket() ? "is a socket" : info.isBlockDevice() ? "is a block device" : "is not a regular file";
  throw new FringekitError("bad-output", `cannot write ${original}: it ${what}; give the path of a file (a missing path, a regular file, a FIFO or a character device)`);
}

function noFolder(original: string, dir: string): FringekitError {
  return new FringekitError("no-directory", `cannot write ${original}: folder ${dir} does not exist; create it first`);
}

const isMissing = (error: unknown) => (error as NodeJS.ErrnoException).code === "ENOENT";
/** Opening a device or FIFO: write only, never create, never make it our controlling terminal. */
const STREAM_FLAGS = constants.O_WRONLY | constants.O_NOCTTY;

/** Resolves symlinks in `target` (a missing last element is allowed) and returns what is there. */
async function inspect(target: string): Promise<{ resolved: string; info?: Stats }> {
  const absolute = path.resolve(target);
  const dir = path.dirname(absolute);
  const dirInfo = await stat(dir).catch(() => undefined);
  if (!dirInfo?.isDirectory()) throw noFolder(target, dir);
  const link = await lstat(absolute).catch((error) => { if (isMissing(error)) return undefined; throw error; });
  if (link === undefined) return { resolved: absolute };
  if (!link.isSymbolicLink()) return { resolved: absolute, info: link };
  const resolved = await realpath(absolute).catch((error) => {
    if (isMissing(error)) throw new FringekitError("bad-output", `cannot write ${target}: it is a symlink to a missing file; remove the link or give another path`);
    throw error;
  });
  return { resolved, info: await stat(resolved) };
}

function inspectSync(target: string): { resolved: string; info?: Stats } {
  const absolute = path.resolve(target);
  const dir = path.dirname(absolute);
  let dirInfo: Stats | undefined;
  try { dirInfo = statSync(dir); } catch { dirInfo = undefined; }
  if (!dirInfo?.isDirectory()) throw noFolder(target, dir);
  let link: Stats | undefined;
  try { link = lstatSync(absolute); } catch (error) { if (!isMissing(error)) throw error; }
  if (link === undefined) return { resolved: absolute };
  if (!link.isSymbolicLink()) return { resolved: absolute, info: link };
  let resolved: string;
  try { resolved = realpathSync(absolute); } catch (error) {
    if (isMissing(error)) throw new FringekitError("bad-output", `cannot write ${target}: it is a symlink to a missing file; remove the link or give another path`);
    throw error;
  }
  return { resolved, info: statSync(resolved) };
}

/**
 * Write `bytes` to `target`: atomically over a regular file or a missing path, streamed into a
 * FIFO or character device, refused for anything else (see the module comment). The folder
 * must exist. Text is written as UTF-8.
 * @param target output path
 * @param bytes  file content
 * @throws FringekitError ("no-directory", "bad-output") with the path and what to do
 */
export async function writeFileAtomic(target: string, bytes: Uint8Array | string): Promise<void> {
  const { resolved, info } = await inspect(target);
  const plan = planFor(target, resolved, info);
  const data = typeof bytes === "string" ? Buffer.from(bytes, "utf8") : bytes;
  if (plan.kind === "stream") {
    const handle = await open(plan.target, STREAM_FLAGS);
    try {
      const kind = await handle.stat();
      if (!kind.isFIFO() && !kind.isCharacterDevice()) throw new FringekitError("bad-output", `cannot write ${target}: it changed while being opened; try again`);
      await handle.writeFile(data);
    } finally {
      await handle.close();
    }
    return;
  }
  const temp = temporaryPathFor(plan.target);
  let created = false;
  try {
    const handle = await open(temp, "wx", 0o666); // O_CREAT|O_EXCL: fails on any existing name, symlinks included
    created = true;
    try {
      await handle.writeFile(data);
      await handle.sync();
    } finally {
      await handle.close();
    }
    if (plan.mode !== undefined) await chmod(temp, plan.mode);
    await rename(temp, plan.target);
  } catch (error) {
    if (created) await unlink(temp).catch(() => undefined);
    throw error;
  }
}

/**
 * Synchronous twin of {@link writeFileAtomic} for the command line (same policy and errors).
 * @param target output path
 * @param bytes  file content (text as UTF-8)
 */
export function writeFileAtomicSync(target: string, bytes: Uint8Array | string): void {
  const { resolved, info } = inspectSync(target);
  const plan = planFor(target, resolved, info);
  const data = typeof bytes === "string" ? Buffer.from(bytes, "utf8") : bytes;
  if (plan.kind === "stream") {
    const fd = openSync(plan.target, STREAM_FLAGS);
    try {
      const kind = fstatSync(fd);
      if (!kind.isFIFO() && !kind.isCharacterDevice()) throw new FringekitError("bad-output", `cannot write ${target}: it changed while being opened; try again`);
      writeAll(fd, data);
    } finally {
      closeSync(fd);
    }
    return;
  }
  const temp = temporaryPathFor(plan.target);
  let created = false;
  try {
    const fd = openSync(temp, "wx", 0o666);
    created = true;
    try {
      writeAll(fd, data);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    if (plan.mode !== undefined) chmodSync(temp, plan.mode);
    renameSync(temp, plan.target);
  } catch (error) {
    if (created) { try { unlinkSync(temp); } catch { /* already gone */ } }
    throw error;
  }
}

/** writeSync until every byte is out (a pipe may take a partial write). */
function writeAll(fd: number, data: Uint8Array): void {
  let offset = 0;
  while (offset < data.length) offset += writeSync(fd, data, offset, data.length - offset);
}
