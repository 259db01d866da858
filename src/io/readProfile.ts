/**
 * Any supported file → Profile: PNG/TIFF frames go through frameToLine, everything else is
 * read as a text table. The SHA-256 of the bytes and the options go into the provenance.
 * (The table half is readTableOrFrame, the frame half readFrameProfile.)
 */
import type { LoadedProfile } from "./parseTable.js";
import { readFrameProfile, type ProfileOptions } from "./readFrameProfile.js";
import { readTableOrFrame } from "./readTableOrFrame.js";

export type { ProfileOptions } from "./readFrameProfile.js";

/**
 * Reads a profile from a file's bytes (text table, PNG or TIFF frame).
 * Frames need the pixel pitch (m) unless the PNG states its resolution in pixels per metre.
 * @param bytes   the file
 * @param options column choice, units, pixel pitch, ROI, dark and flat frames, masking
 */
export function readProfile(bytes: Uint8Array, options: ProfileOptions = {}): LoadedProfile {
  return readTableOrFrame(bytes, options, readFrameProfile);
}
