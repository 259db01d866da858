/**
 * What kind of file a byte array is, from its first bytes only: PNG and TIFF signatures, and the
 * names of common formats fringekit does not read. Kept apart from the decoders so that reading
 * a text table never loads them (the `fringekit fit` start, benchmark B9).
 */
import { isTiff } from "./readTiffDirectories.js";

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** True when the bytes start with the PNG signature (PNG specification §5.2). */
export function isPng(bytes: Uint8Array): boolean {
  return bytes.length >= 8 && PNG_SIGNATURE.every((b, i) => bytes[i] === b);
}

/**
 * True when the bytes are a PNG or TIFF image (by signature).
 * @param bytes the file (the first 8 bytes are enough)
 */
export function isImage(bytes: Uint8Array): boolean {
  return isPng(bytes) || isTiff(bytes);
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
