/**
 * PNG bytes → ImageStack with the npm package fast-png; the header is checked first so that
 * corrupt, truncated, unsupported or oversized images give a clear error, not a crash.
 * Format: PNG specification (ISO/IEC 15948, W3C PNG 2nd edition), §11.2.2 IHDR.
 */
import { decode as decodePngBytes } from "fast-png";
import { DataError, FringekitError } from "../errors.js";
import type { ImageStack } from "./imageTypes.js";
import { MAX_IMAGE_PIXELS } from "./limits.js";

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** True when the bytes start with the PNG signature. */
export function isPng(bytes: Uint8Array): boolean {
  return bytes.length >= 8 && SIGNATURE.every((b, i) => bytes[i] === b);
}

/**
 * Decodes an 8- or 16-bit grey or RGB PNG (alpha ignored; indexed colour and bit depths below 8
 * are refused). RGB pixels become the mean of R, G and B.
 * @param bytes  the file
 * @param source file name for messages
 */
export function decodePng(bytes: Uint8Array, source: string): ImageStack {
  if (!isPng(bytes)) throw new DataError(source, "not a PNG file (wrong signature)", "give a PNG, a TIFF or a text table");
  if (bytes.length < 33) throw new DataError(source, "truncated PNG: the file ends inside the header", "export the image again");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const width = view.getUint32(16);
  const height = view.getUint32(20);
  const depth = bytes[24] as number;
  const colour = bytes[25] as number;
  if (String.fromCharCode(...bytes.subarray(12, 16)) !== "IHDR") throw new DataError(source, "corrupt PNG: the first chunk is not IHDR", "export the image again");
  if (width === 0 || height === 0) throw new DataError(source, `corrupt PNG: image size ${width} × ${height}`, "export the image again");
  if (width * height > MAX_IMAGE_PIXELS) {
    throw new DataError(source, `the image has ${width} × ${height} pixels, above the limit of ${MAX_IMAGE_PIXELS}`, "crop the image before loading it");
  }
  if (colour === 3) throw new DataError(source, "indexed-colour (palette) PNG is not supported", "save the frame as 8- or 16-bit greyscale");
  if (depth !== 8 && depth !== 16) throw new DataError(source, `PNG bit depth ${depth} is not supported`, "save the frame as 8- or 16-bit greyscale");
  if (![0, 2, 4, 6].includes(colour)) throw new DataError(source, `corrupt PNG: colour type ${colour}`, "export the image again");
  let decoded;
  try {
    decoded = decodePngBytes(bytes, { checkCrc: true });
  } catch (error) {
    if (error instanceof FringekitError) throw error;
    throw new DataError(source, `corrupt or truncated PNG (${describe(error)})`, "export the image again or check the copy is complete");
  }
  const pixels = decoded.width * decoded.height;
  const channels = decoded.channels;
  if (decoded.data.length < pixels * channels) throw new DataError(source, "truncated PNG: fewer pixels than the header states", "export the image again");
  const notes: string[] = [];
  const colourChannels = channels >= 3 ? 3 : 1;
  let page: Uint8Array | Uint16Array | Float32Array;
  if (colourChannels === 1 && channels === 1) page = decoded.data instanceof Uint8ClampedArray ? new Uint8Array(decoded.data.buffer, decoded.data.byteOffset, decoded.data.length) : decoded.data;
  else {
    const grey = colourChannels === 3 ? new Float32Array(pixels) : depth === 16 ? new Uint16Array(pixels) : new Uint8Array(pixels);
    const data = decoded.data;
    for (let i = 0, k = 0; i < pixels; i++, k += channels) {
      grey[i] = colourChannels === 3 ? ((data[k] as number) + (data[k + 1] as number) + (data[k + 2] as number)) / 3 : (data[k] as number);
    }
    page = grey;
    notes.push(colourChannels === 3 ? "RGB pixels averaged to grey" : "alpha channel ignored");
  }
  const stack: ImageStack = {
    width: decoded.width,
    height: decoded.height,
    bitDepth: depth as 8 | 16,
    sampleFormat: "uint",
    pages: [page],
    integerCodes: colourChannels === 1,
    topCode: colourChannels === 1 ? 2 ** depth - 1 : undefined,
    format: "png",
    notes,
  };
  if (decoded.resolution && decoded.resolution.unit === 1 && decoded.resolution.x > 0) stack.pixelPitchFromFile = 1 / decoded.resolution.x;
  return stack;
}

/** Short description of a decoder's exception, without a stack trace. */
export function describe(error: unknown): string {
  // Decoder messages may end in a dangling colon ("Error while decompressing the data:").
  const text = (error instanceof Error ? error.message : String(error)).replace(/[\s:]+$/, "");
  return text.length > 120 ? `${text.slice(0, 117)}...` : text;
}
