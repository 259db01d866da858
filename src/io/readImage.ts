/** Image bytes (PNG or TIFF) → ImageStack, chosen by the file's signature. */
import { DataError } from "../errors.js";
import { decodePng, isPng } from "./decodePng.js";
import { decodeTiff } from "./decodeTiff.js";
import type { ImageStack } from "./imageTypes.js";
import { checkFileSize } from "./limits.js";
import { isTiff } from "./readTiffDirectories.js";

/**
 * Decodes a PNG or TIFF image from its bytes.
 * @param bytes  the file
 * @param source file name for messages
 */
export function readImage(bytes: Uint8Array, source = "image"): ImageStack {
  checkFileSize(bytes.length, source, "image");
  if (bytes.length === 0) throw new DataError(source, "the file is empty", "give a PNG or TIFF frame");
  if (isPng(bytes)) return decodePng(bytes, source);
  if (isTiff(bytes) || (bytes.length >= 4 && (bytes[0] === 0x49 || bytes[0] === 0x4d) && bytes[0] === bytes[1])) return decodeTiff(bytes, source);
  throw new DataError(source, `not a supported image (${sniffFormat(bytes)})`, "give an 8- or 16-bit PNG, or an 8/16-bit or 32-bit float TIFF");
}

/**
 * Names common image formats fringekit does not read, from their first bytes.
 * @param bytes the file
 */
export function sniffFormat(bytes: Uint8Array): string {
  const text = String.fromCharCode(...bytes.subarray(0, 12));
  if (bytes[0] === 0xff && bytes[1] === 0xd8) return "a JPEG image, whose lossy compression alters intensities";
  if (text.startsWith("GIF8")) return "a GIF image";
  if (text.startsWith("BM") && [12, 40, 108, 124].includes(bytes[14] ?? 0) && bytes[15] === 0) return "a BMP image";
  if (text.startsWith("RIFF") && text.slice(8, 12) === "WEBP") return "a WebP image";
  if (text.startsWith("SIMPLE  =")) return "a FITS file";
  if (bytes[0] === 0x89 && text.slice(1, 4) === "HDF") return "an HDF5 file";
  return "unknown format";
}
