/**
 * PNG bytes → ImageStack with the npm package fast-png; the header is checked first so that
 * corrupt, truncated, unsupported or oversized images give a clear error, not a crash.
 * Format: PNG specification (ISO/IEC 15948, W3C PNG 2nd edition), §11.2.2 IHDR.
 */
import { decode as decodePngBytes } from "fast-png";
import { DataError, FringekitError } from "../errors.js";
import type { ImageStack } from "./imageTypes.js";
import { InflateLimitExceeded, inflatedSize } from "./boundedInflate.js";
import { formatBytes, INFLATE_SLACK_BYTES, MAX_DECODED_IMAGE_BYTES, MAX_IMAGE_PIXELS } from "./limits.js";
import { isPng } from "./fileSignature.js";

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
  const channels0 = CHANNELS[colour]!;
  const decodedBytes = width * height * channels0 * (depth / 8);
  if (decodedBytes > MAX_DECODED_IMAGE_BYTES) {
    throw new DataError(source, `the image is ${width} × ${height} pixels × ${channels0} channel(s) × ${depth / 8} byte(s), ${formatBytes(decodedBytes)} decoded, above the ${formatBytes(MAX_DECODED_IMAGE_BYTES)} limit`, "crop the image or save it as 8- or 16-bit greyscale");
  }
  const essential = essentialChunks(bytes, source);
  const expected = filteredSize(width, height, channels0 * depth, bytes[28] === 1);
  try {
    inflatedSize(essential.idat, expected + INFLATE_SLACK_BYTES);
  } catch (error) {
    if (error instanceof InflateLimitExceeded) {
      throw new DataError(source, `the pixel data inflate to more than the ${formatBytes(expected)} the ${width} × ${height} header implies (a decompression bomb or a corrupt file)`, "export the image again; do not load files from untrusted sources");
    }
    throw new DataError(source, `corrupt or truncated PNG (${describe(error)})`, "export the image again or check the copy is complete");
  }
  let decoded;
  try {
    // Only IHDR, pHYs, IDAT and IEND reach the decoder: ancillary chunks (iCCP, zTXt, iTXt…) could inflate without bound.
    decoded = decodePngBytes(essential.png, { checkCrc: true });
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

/** Channels per colour type (PNG §11.2.2 Table 11.1): grey, -, RGB, palette, grey+alpha, -, RGBA. */
const CHANNELS: Record<number, number> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };

/**
 * Bytes of filtered scanlines the header implies (PNG §7.2, §8.2): each row has one filter
 * byte and ceil(width × bits per pixel / 8) data bytes; Adam7 interlacing has seven sub-images.
 */
function filteredSize(width: number, height: number, bitsPerPixel: number, interlaced: boolean): number {
  const rows = (w: number, h: number) => (w > 0 && h > 0 ? h * (1 + Math.ceil((w * bitsPerPixel) / 8)) : 0);
  if (!interlaced) return rows(width, height);
  const passes = [[0, 0, 8, 8], [4, 0, 8, 8], [0, 4, 4, 8], [2, 0, 4, 4], [0, 2, 2, 4], [1, 0, 2, 2], [0, 1, 1, 2]] as const;
  return passes.reduce((sum, [x0, y0, dx, dy]) => sum + rows(Math.ceil((width - x0) / dx), Math.ceil((height - y0) / dy)), 0);
}

/**
 * Walks the chunk list (bounds-checked) and returns the concatenated IDAT data and a PNG with
 * only the chunks the decoder needs (IHDR, pHYs, IDAT, IEND; copied verbatim with their CRCs).
 */
function essentialChunks(bytes: Uint8Array, source: string): { idat: Uint8Array; png: Uint8Array } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const kept: Uint8Array[] = [bytes.subarray(0, 8)];
  const idat: Uint8Array[] = [];
  let at = 8;
  let ended = false;
  while (at + 12 <= bytes.length) {
    const length = view.getUint32(at);
    const type = String.fromCharCode(bytes[at + 4]!, bytes[at + 5]!, bytes[at + 6]!, bytes[at + 7]!);
    const end = at + 12 + length;
    if (end > bytes.length) break; // truncated: the decoder reports it
    if (type === "IDAT") idat.push(bytes.subarray(at + 8, at + 8 + length));
    if (type === "IHDR" || type === "pHYs" || type === "IDAT" || type === "IEND") kept.push(bytes.subarray(at, end));
    at = end;
    if (type === "IEND") { ended = true; break; }
  }
  if (!ended) kept.push(bytes.subarray(at)); // let the decoder see and report the truncation
  const join = (parts: Uint8Array[]) => {
    const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
    let k = 0;
    for (const p of parts) { out.set(p, k); k += p.length; }
    return out;
  };
  if (idat.length === 0) throw new DataError(source, "corrupt or truncated PNG: no image data (IDAT) chunk", "export the image again");
  return { idat: join(idat), png: join(kept) };
}

/** Short description of a decoder's exception, without a stack trace. */
export function describe(error: unknown): string {
  // Decoder messages may end in a dangling colon ("Error while decompressing the data:").
  const text = (error instanceof Error ? error.message : String(error)).replace(/[\s:]+$/, "");
  return text.length > 120 ? `${text.slice(0, 117)}...` : text;
}
