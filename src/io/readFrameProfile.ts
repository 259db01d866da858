/**
 * A camera frame's bytes (PNG or TIFF) → Profile: decode, frameToLine, then positions in metres.
 * The half of readProfile that needs the image decoders (fast-png, fflate, utif2), kept in its
 * own module so that a table is read without loading them.
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import type { Profile } from "../profile.js";
import { checkPlausibleLength } from "../units/plausibility.js";
import { frameToLine, type FrameOptions, type LineProfile } from "./frameToLine.js";
import type { LoadedProfile, TableOptions } from "./parseTable.js";
import { readImage } from "./readImage.js";
import { sha256Hex } from "./sha256.js";

/** Options for readProfile: those of tables and of frames. */
export type ProfileOptions = TableOptions & Omit<FrameOptions, "maskSaturated">;

/**
 * Reads a profile from the bytes of a PNG or TIFF frame. Positions are pixel × pitch (m); the
 * pitch comes from `options.pixelPitch` (m) or the PNG's own resolution record (pixels per metre).
 * @param bytes   the image file
 * @param options ROI, dark and flat frames, tilt, page, masking, pixel pitch (m)
 * @param source  file name for messages and provenance
 * @throws DataError when the image cannot be read or no pixel pitch is known
 */
export function readFrameProfile(bytes: Uint8Array, options: ProfileOptions, source: string): LoadedProfile {
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
