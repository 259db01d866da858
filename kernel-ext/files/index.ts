/**
 * Node-side files for notebooks and scripts ("fringekit/files"): read a profile from a path,
 * write a results file atomically (folders created), read one back. The library itself (src/)
 * never touches the file system.
 */
import { mkdir, readFile } from "node:fs/promises";
import path from "node:path";
import { readProfile, type ProfileOptions } from "../../src/io/readProfile.js";
import type { LoadedProfile } from "../../src/io/parseTable.js";
import { parseResults, type DocumentOptions, type ResultsDocument } from "../../src/report/results/resultsDocument.js";
import { InvalidArgumentError } from "../../src/errors.js";
import { writeFileAtomic } from "../figures/atomicWrite.js";

/**
 * Reads a data file (text table, PNG or TIFF frame) into a profile; the file's name (without
 * folders) becomes the profile's source unless options.source says otherwise.
 * @param file    path of the data file; it is only read, never written
 * @param options column choice, units, pixel pitch (m), ROI, dark and flat frames (see readProfile)
 * @example const { profile } = await loadProfile("data/line.csv"); // x in m
 */
export async function loadProfile(file: string, options: ProfileOptions = {}): Promise<LoadedProfile> {
  const bytes = await readFile(file);
  return readProfile(bytes, { source: path.basename(file), ...options });
}

/** Anything that writes its results file: a Fit, a Comparison, or a ResultsDocument's text. */
export interface HasResultsText {
  toResultsText(options?: DocumentOptions): string;
}

/**
 * Writes the results file of a fit or comparison (JSON, see parseResults) atomically, creating
 * its folders: readers see the old file or the complete new one, never a part.
 * @param what   a Fit (from fitProfile) or a Comparison (from compare)
 * @param file   target path, e.g. "out/results/first-fit.json"
 * @param options derived quantities, notes, seeds to record beside the fits
 * @returns the path written
 */
export async function saveResults(what: HasResultsText, file: string, options: DocumentOptions = {}): Promise<string> {
  if (!what || typeof what.toResultsText !== "function") {
    throw new InvalidArgumentError("results", typeof what, "a fit from fitProfile or a comparison from compare");
  }
  await mkdir(path.dirname(path.resolve(file)), { recursive: true });
  await writeFileAtomic(file, what.toResultsText(options));
  return file;
}

/**
 * Reads a results file written by saveResults (or `fringekit fit --out`).
 * @throws DataError naming the file when it is not a fringekit results file of a readable version
 */
export async function loadResults(file: string): Promise<ResultsDocument> {
  return parseResults(await readFile(file, "utf8"), path.basename(file));
}

/**
 * Writes a text file (e.g. a summary) atomically, creating its folders.
 * @returns the path written
 */
export async function saveText(file: string, text: string): Promise<string> {
  if (typeof text !== "string") throw new InvalidArgumentError("text", typeof text, "a string");
  await mkdir(path.dirname(path.resolve(file)), { recursive: true });
  await writeFileAtomic(file, text);
  return file;
}
