/**
 * Size limits: a file above them is refused before it is parsed, so a huge or hostile file
 * cannot exhaust memory silently. The command line checks the size before reading the file.
 */
import { DataError } from "../errors.js";

/** Largest text table read (bytes): 64 MiB, about 3 million rows of three columns. */
export const MAX_TABLE_BYTES = 64 * 1024 * 1024;
/** Largest image file read (bytes): 512 MiB, e.g. a stack of 60 frames of 2048² 16-bit pixels. */
export const MAX_IMAGE_BYTES = 512 * 1024 * 1024;
/** Largest decoded image (pixels over all pages): 2²⁸ ≈ 268 million, about 2 GiB as float64. */
export const MAX_IMAGE_PIXELS = 2 ** 28;
/**
 * Largest decoded sample data of an image (bytes over all pages: pixels × channels × bytes per
 * sample): 512 MiB, e.g. 60 frames of 2048² 16-bit grey or one 16384² 16-bit grey frame. It
 * bounds the memory of decoding (README, "Limits and security") and the work of inflating.
 */
export const MAX_DECODED_IMAGE_BYTES = 512 * 1024 * 1024;
/** Slack allowed past the inflated size a header implies (bytes): trailing padding some writers add. */
export const INFLATE_SLACK_BYTES = 64 * 1024;
/** Largest number of data rows in a table. */
export const MAX_TABLE_ROWS = 5_000_000;

/**
 * Throws a DataError when a file is larger than the limit of its kind.
 * @param byteLength file size (bytes)
 * @param source     file name for the message
 * @param kind       "table" or "image"
 */
export function checkFileSize(byteLength: number, source: string, kind: "table" | "image"): void {
  const limit = kind === "table" ? MAX_TABLE_BYTES : MAX_IMAGE_BYTES;
  if (byteLength > limit) {
    throw new DataError(
      source,
      `the file is ${formatBytes(byteLength)}, above the ${formatBytes(limit)} limit for ${kind === "table" ? "text tables" : "images"}`,
      kind === "table" ? "split it into smaller files or keep only the rows of one profile" : "crop or split the stack into smaller files",
    );
  }
}

/** "12.3 MiB" style size text of a size given in bytes. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  const units = ["KiB", "MiB", "GiB", "TiB"];
  let value = bytes / 1024;
  let index = 0;
  while (value >= 1024 && index < units.length - 1) {
    value /= 1024;
    index++;
  }
  return `${value.toFixed(value < 10 ? 1 : 0)} ${units[index]}`;
}
