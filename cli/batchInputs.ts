/**
 * The inputs of a batch, in their fixed order: files and folders from the command line, then
 * the paths of each `--list` file (one path per line), folders replaced by their data files;
 * with `--page each`, an image stack becomes one input per page.
 */
import { readFileSync } from "node:fs";
import { DataError, isTiff, readTiffDirectories } from "../src/advanced.js";
import type { BatchInput } from "./batchRow.js";
import { expandFolders, readInputFile } from "./files.js";

/**
 * Reads a list file: one path per line; blank lines and lines starting with # are skipped;
 * surrounding spaces are trimmed. Relative paths are relative to the current folder (as on the
 * command line), not to the list file.
 * @param listPath the list file
 */
export function readListFile(listPath: string): string[] {
  let text: string;
  try {
    text = readFileSync(listPath, "utf8");
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new DataError(listPath, code === "ENOENT" ? "no such list file" : `the list file cannot be read (${code ?? String(error)})`, "give a text file with one data file path per line");
  }
  const paths: string[] = [];
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!.trim();
    if (line === "" || line.startsWith("#")) continue;
    if (line.includes("\0")) throw new DataError(listPath, `line ${i + 1} holds a NUL character`, "write one plain path per line");
    paths.push(line);
  }
  if (paths.length === 0) throw new DataError(listPath, "the list file names no files", "write one data file path per line (lines starting with # are comments)");
  return paths;
}

/**
 * All inputs of a batch in order.
 * @param positionals files and folders given on the command line
 * @param lists       list files (--list), read after the positionals
 * @param eachPage    whether an image stack gives one input per page (--page each)
 */
export function collectInputs(positionals: readonly string[], lists: readonly string[], eachPage: boolean): BatchInput[] {
  const paths = expandFolders([...positionals, ...lists.flatMap(readListFile)]);
  if (!eachPage) return paths.map((path) => ({ path }));
  return paths.flatMap((path) => {
    const count = stackPages(path);
    return count === undefined ? [{ path }] : Array.from({ length: count }, (_, i) => ({ path, page: i + 1 }));
  });
}

/** Number of pages of a TIFF stack; undefined for other files (a PNG has one frame; unreadable files are reported by their row). */
function stackPages(path: string): number | undefined {
  let bytes: Uint8Array;
  try {
    bytes = readInputFile(path);
  } catch {
    return undefined;
  }
  if (!isTiff(bytes)) return undefined;
  try {
    return readTiffDirectories(bytes, path).pages.length;
  } catch {
    return undefined;
  }
}

/**
 * How an input is named in messages: "a.tif" or "a.tif page 3".
 * @param input the input
 */
export function inputLabel(input: BatchInput): string {
  return input.page === undefined ? input.path : `${input.path} page ${input.page}`;
}
