/**
 * File access for the command: size checked before reading, outputs written atomically
 * (temporary file in the same folder, then rename), never over an input file.
 */
import { readdirSync, readFileSync, statSync, openSync, readSync, closeSync, realpathSync } from "node:fs";
import { basename, dirname, join, resolve } from "node:path";
import { writeFileAtomicSync } from "../kernel-ext/figures/atomicWrite.js";
import { FringekitError, DataError, MAX_IMAGE_BYTES, MAX_TABLE_BYTES, checkFileSize, isImage } from "../src/advanced.js";

/**
 * Reads a data file after checking that it exists, is a regular file and is not too large
 * (text tables up to MAX_TABLE_BYTES, images up to MAX_IMAGE_BYTES).
 * @param path file path as given on the command line
 */
export function readInputFile(path: string): Uint8Array {
  const name = basename(path);
  let size: number;
  try {
    const stat = statSync(path);
    if (!stat.isFile()) throw new DataError(path, "not a regular file", "give the path of a data file");
    size = stat.size;
  } catch (error) {
    if (error instanceof DataError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError(path, code === "ENOENT" ? "no such file" : code === "EACCES" ? "permission denied" : `cannot be read (${code ?? String(error)})`, "check the path");
  }
  if (size > Math.min(MAX_TABLE_BYTES, MAX_IMAGE_BYTES)) {
    const head = new Uint8Array(8);
    const fd = openSync(path, "r");
    try { readSync(fd, head, 0, 8, 0); } finally { closeSync(fd); }
    checkFileSize(size, name === path ? path : path, isImage(head) ? "image" : "table");
  }
  try {
    return new Uint8Array(readFileSync(path));
  } catch (error) {
    throw new DataError(path, `cannot be read (${(error as NodeJS.ErrnoException).code ?? String(error)})`, "check the path and its permissions");
  }
}

/**
 * Writes text or bytes with the project's one writer (writeFileAtomicSync): atomically over a
 * regular file or a missing path, streamed into a FIFO or character device (`--out /dev/stdout`),
 * refused for folders and other special files. Refuses to overwrite any of the input files.
 * @param path    output path
 * @param content text (UTF-8) or bytes
 * @param inputs  input paths that must not be overwritten
 */
export function writeOutputFile(path: string, content: string | Uint8Array, inputs: readonly string[] = []): void {
  const target = resolve(path);
  for (const input of inputs) {
    if (sameFile(target, input)) throw new DataError(path, "the output file is one of the input files", "choose another output name; input files are never changed");
  }
  try {
    writeFileAtomicSync(target, content);
  } catch (error) {
    if (error instanceof FringekitError && error.code === "bad-output") throw new DataError(path, "not a file that can be written (a folder, socket or block device)", "give the path of a file, a FIFO or a character device");
    throw new DataError(path, `cannot be written (${(error as NodeJS.ErrnoException).code ?? String(error)})`, "check that the folder exists and is writable");
  }
}

/**
 * Checks an output path before any work: its folder exists and it is not an input file.
 * @param path   output path
 * @param inputs input paths that must not be overwritten
 */
export function checkOutputPath(path: string, inputs: readonly string[] = []): void {
  const target = resolve(path);
  for (const input of inputs) {
    if (sameFile(target, input)) throw new DataError(path, "the output file is one of the input files", "choose another output name; input files are never changed");
  }
  let folder: ReturnType<typeof statSync> | undefined;
  try { folder = statSync(dirname(target)); } catch { folder = undefined; }
  if (!folder?.isDirectory()) throw new DataError(path, "the output folder does not exist", "create the folder first or choose another path");
}

function sameFile(target: string, input: string): boolean {
  const real = (p: string): string => { try { return realpathSync(p); } catch { return resolve(p); } };
  return real(target) === real(input);
}

/** File name endings the commands read as data (text tables and camera frames). */
const DATA_ENDINGS = /\.(csv|tsv|txt|dat|png|tif|tiff)$/i;

/**
 * The data files named on a command line, with each folder replaced by its data files
 * (.csv, .tsv, .txt, .dat, .png, .tif, .tiff; sorted by name; not recursive, hidden files skipped).
 * Paths that are not folders pass through unchanged, so a missing file is reported by its row.
 * @param paths the paths as given
 */
export function expandFolders(paths: readonly string[]): string[] {
  return paths.flatMap((path) => {
    let names: string[];
    try {
      if (!statSync(path).isDirectory()) return [path];
      names = readdirSync(path);
    } catch {
      return [path];
    }
    const files = names.filter((n) => !n.startsWith(".") && DATA_ENDINGS.test(n)).sort().map((n) => join(path, n));
    if (files.length === 0) throw new DataError(path, "a folder with no data files (.csv, .tsv, .txt, .dat, .png, .tif, .tiff)", "give the data files or the folder that holds them");
    return files;
  });
}
