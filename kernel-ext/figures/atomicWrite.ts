/** Atomic file output: write a temporary file beside the target, then rename it over the target. */
import { randomBytes } from "node:crypto";
import { rename, stat, unlink, writeFile } from "node:fs/promises";
import path from "node:path";
import { FringekitError } from "../../src/errors.js";

/**
 * Write `bytes` to `target` atomically: readers see the old file or the complete new one,
 * never a partial file. The directory must exist.
 */
export async function writeFileAtomic(target: string, bytes: Uint8Array | string): Promise<void> {
  const dir = path.dirname(path.resolve(target));
  const dirStat = await stat(dir).catch(() => null);
  if (!dirStat?.isDirectory()) {
    throw new FringekitError("no-directory", `cannot write ${target}: folder ${dir} does not exist; create it first`);
  }
  const temp = path.join(dir, `.${path.basename(target)}.${process.pid}.${randomBytes(4).toString("hex")}.tmp`);
  try {
    await writeFile(temp, bytes);
    await rename(temp, target);
  } catch (error) {
    await unlink(temp).catch(() => undefined);
    throw error;
  }
}
