/**
 * Any supported file → Profile, with the frame reader passed in: text tables are read here,
 * PNG/TIFF frames go to `readFrame`. readProfile passes the decoding reader (readFrameProfile);
 * a caller that can load modules lazily (the `fringekit` command) passes it only for images, so
 * reading a table never loads the image decoders.
 */
import { DataError } from "../errors.js";
import { isImage, sniffFormat } from "./fileSignature.js";
import { readTable, type LoadedProfile } from "./parseTable.js";
import type { ProfileOptions } from "./readFrameProfile.js";

/** Reads a PNG or TIFF frame into a profile (readFrameProfile's shape). */
export type FrameProfileReader = (bytes: Uint8Array, options: ProfileOptions, source: string) => LoadedProfile;

/**
 * Reads a profile from a file's bytes: a text table, or a frame through `readFrame`.
 * @param bytes     the file
 * @param options   column choice, units, pixel pitch (m), ROI, dark and flat frames, masking
 * @param readFrame reader for PNG/TIFF frames (readFrameProfile); called only when the bytes are an image
 * @throws DataError for a format that is neither a table nor a supported image
 */
export function readTableOrFrame(bytes: Uint8Array, options: ProfileOptions, readFrame: FrameProfileReader): LoadedProfile {
  const image = isImage(bytes);
  const source = options.source ?? (image ? "frame" : "table");
  if (image) return readFrame(bytes, options, source);
  const format = sniffFormat(bytes);
  if (format !== "unknown format") throw new DataError(source, `not a supported file (${format})`, "give a text table, an 8- or 16-bit PNG, or an 8/16-bit or 32-bit float TIFF");
  return readTable(bytes, { ...options, source });
}
