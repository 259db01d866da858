/**
 * The read options recorded in a profile's provenance (and in results files) → the options
 * that read the same file into the same profile again, for replay.
 */
import { InvalidArgumentError } from "../errors.js";
import type { RegionOfInterest } from "./frameToLine.js";
import type { ProfileOptions } from "./readProfile.js";

/** Options to re-read a file, and the extra frames it needs (dark/flat are separate files). */
export interface ReplayReadOptions {
  options: ProfileOptions;
  needsDark: boolean;
  needsFlat: boolean;
}

/**
 * Rebuilds reading options from `provenance.options` as written by readTable / readProfile.
 * A measured tilt is replayed as the recorded number, so the same profile comes back.
 * @param record the recorded options
 * @param source file name for messages
 */
export function readOptionsFromRecord(record: Record<string, unknown>, source: string): ReplayReadOptions {
  const options: ProfileOptions = { source };
  const columns = record["columns"] as { x?: unknown; y?: unknown; sigma?: unknown } | undefined;
  const column = (value: unknown): string | number | undefined => (typeof value === "string" || typeof value === "number" ? value : undefined);
  if (columns) {
    const x = column(columns.x), y = column(columns.y);
    if (x !== undefined) options.x = x;
    if (y !== undefined) options.y = y;
    options.sigma = columns.sigma === null ? false : (column(columns.sigma) ?? false);
  }
  const number = (key: string): number | undefined => {
    const value = record[key];
    if (value === undefined) return undefined;
    if (typeof value !== "number" || !Number.isFinite(value)) throw new InvalidArgumentError(`recorded read option ${key}`, value, "a finite number");
    return value;
  };
  const pitch = number("pixelPitch");
  if (pitch !== undefined) options.pixelPitch = pitch;
  if (typeof record["xUnit"] === "string") options.xUnit = record["xUnit"];
  if (typeof record["maskSaturated"] === "boolean") options.maskSaturated = record["maskSaturated"];
  // Tables recorded before saturated samples were masked by default kept them: replay them so.
  else if (record["format"] === "table") options.maskSaturated = false;
  const delimiter = record["delimiter"];
  if (delimiter === "," || delimiter === ";" || delimiter === "whitespace") options.delimiter = delimiter;
  if (delimiter === "tab") options.delimiter = "\t";
  if (record["format"] === "png" || record["format"] === "tiff") {
    const roi = record["roi"] as RegionOfInterest | undefined;
    if (roi) options.roi = { x: roi.x, y: roi.y, width: roi.width, height: roi.height };
    const tilt = number("tilt");
    if (tilt !== undefined) options.tilt = tilt;
    const page = record["page"];
    if (page === "mean" || typeof page === "number") options.page = page;
  }
  return { options, needsDark: record["dark"] === true || typeof record["dark"] === "string", needsFlat: record["flat"] === true || typeof record["flat"] === "string" };
}
