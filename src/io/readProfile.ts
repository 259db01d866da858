/**
 * Any supported file → Profile: PNG/TIFF frames go through frameToLine, everything else is
 * read as a text table. The SHA-256 of the bytes and the options go into the provenance.
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import type { Profile } from "../profile.js";
import { isPng } from "./decodePng.js";
import { frameToLine, type FrameOptions, type LineProfile } from "./frameToLine.js";
import { readImage, sniffFormat } from "./readImage.js";
import { readTable, type LoadedProfile, type TableOptions } from "./parseTable.js";
import { isTiff } from "./readTiffDirectories.js";
import { sha256Hex } from "./sha256.js";
import { checkPlausibleLength } from "../units/plausibility.js";

/** Options for readProfile: those of tables and of frames. */
export type ProfileOptions = TableOptions & Omit<FrameOptions, "maskSaturated">;

/**
 * True when the bytes are a PNG or TIFF image (by signature).
 * @param bytes the file (the first 4 bytes are enough)
 */
export function isImage(bytes: Uint8Array): boolean {
  return isPng(bytes) || isTiff(bytes);
}

/**
 * Reads a profile from a file's bytes (text table, PNG or TIFF frame).
 * Frames need the pixel pitch (m) unless the PNG states its resolution in pixels per metre.
 * @param bytes   the file
 * @param options column choice, units, pixel pitch, ROI, dark and flat frames, masking
 */
export function readProfile(bytes: Uint8Array, options: ProfileOptions = {}): LoadedProfile {
  const source = options.source ?? (isImage(bytes) ? "frame" : "table");
  if (!isImage(bytes)) {
    const format = sniffFormat(bytes);
    if (format !== "unknown format") throw new DataError(source, `not a supported file (${format})`, "give a text table, an 8- or 16-bit PNG, or an 8/16-bit or 32-bit float TIFF");
    return readTable(bytes, { ...options, source });
  }
  const stack = readImage(bytes, source);
  const line = frameToLine(stack, { ...options, source, maskSaturated: options.maskSaturated ?? true });
  const pitch = options.pixelPitch ?? stack.pixelPitchFromFile;
  if (pitch === undefined) throw new DataError(source, "a camera frame gives positions in pixels", "give the pixel pitch (--pixel-pitch 5.5 um)");
  return lineToProfile(line, pitch, source, sha256Hex(bytes), stack.integerCodes);
}

/**
 * Line profile (pixels) → Profile (metres): x = pixel × pitch.
 * @param line    output of frameToLine
 * @param pitch   pixel pitch (m)
 * @param source  file name
 * @param sha256  SHA-256 of the frame file (hex)
 * @param fromCounts whether the frame held integer detector codes (noted; averaged values are not counts)
 */
export function lineToProfile(line: LineProfile, pitch: number, source: string, sha256: string, fromCounts: boolean): LoadedProfile {
  if (!(pitch > 0) || !Number.isFinite(pitch)) throw new InvalidArgumentError("pixelPitch", pitch, "a positive length in metres");
  checkPlausibleLength("pixelPitch", pitch, "pixelPitch");
  const x = new Float64Array(line.pixel.length);
  for (let i = 0; i < x.length; i++) x[i] = line.pixel[i]! * pitch;
  const profile: Profile = {
    x,
    y: line.y,
    sigma: line.sigma,
    mask: line.mask,
    yUnit: fromCounts ? "counts (row mean)" : "a.u.",
    counts: false,
    provenance: {
      source,
      sha256,
      options: { ...line.options, pixelPitch: pitch },
      notes: [...line.notes, ...line.warnings],
    },
    ...(line.coded && line.coded.length > 0 ? { warnings: line.coded.map((w) => ({ ...w })) } : {}),
  };
  return { profile, warnings: line.warnings };
}
