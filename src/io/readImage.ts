/** Image bytes (PNG or TIFF) → ImageStack, chosen by the file's signature. */
import { DataError } from "../errors.js";
import { decodePng } from "./decodePng.js";
import { decodeTiff } from "./decodeTiff.js";
import type { ImageStack } from "./imageTypes.js";
import { checkFileSize } from "./limits.js";
import { isTiff } from "./readTiffDirectories.js";
import { isPng, sniffFormat } from "./fileSignature.js";

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
