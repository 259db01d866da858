/**
 * TIFF bytes → ImageStack: 8/16-bit integer and 32-bit float, grey or RGB, single or
 * multi-page, uncompressed or LZW/Deflate/PackBits. The structure is checked by
 * readTiffDirectories; pixel data are decompressed by the npm package utif2.
 */
import * as utifModule from "utif2";
import { DataError, FringekitError } from "../errors.js";
import { InflateLimitExceeded, inflatedSize } from "./boundedInflate.js";
import { describe } from "./decodePng.js";
import { formatBytes, INFLATE_SLACK_BYTES } from "./limits.js";
import type { ImageStack, PixelArray } from "./imageTypes.js";
import { readTiffDirectories, type TiffPage } from "./readTiffDirectories.js";

interface UtifApi {
  decodeImage(buffer: ArrayBuffer, ifd: Record<string, unknown>, ifds?: unknown[]): void;
}
// utif2 is CommonJS: its functions sit on the default export under Node's ESM loader.
const UTIF = ((utifModule as unknown as { default?: UtifApi }).default ?? utifModule) as unknown as UtifApi;

/**
 * Decodes every page of a TIFF file. Pages must share size and sample type.
 * @param bytes  the file
 * @param source file name for messages
 */
export function decodeTiff(bytes: Uint8Array, source: string): ImageStack {
  const structure = readTiffDirectories(bytes, source);
  const first = structure.pages[0]!;
  for (let i = 1; i < structure.pages.length; i++) {
    const page = structure.pages[i]!;
    if (page.width !== first.width || page.height !== first.height || page.bitsPerSample !== first.bitsPerSample || page.samplesPerPixel !== first.samplesPerPixel) {
      throw new DataError(source, `page ${i + 1} is ${page.width} × ${page.height} (${page.bitsPerSample}-bit), page 1 is ${first.width} × ${first.height} (${first.bitsPerSample}-bit)`, "keep only frames of one size and type in a stack");
    }
  }
  const buffer = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? (bytes.buffer as ArrayBuffer) : bytes.slice().buffer;
  const pages = structure.pages.map((page, index) => decodePage(bytes, buffer, page, structure.littleEndian, source, index + 1));
  const colour = first.samplesPerPixel >= 3;
  const float = first.sampleFormat === 3;
  return {
    width: first.width,
    height: first.height,
    bitDepth: first.bitsPerSample as 8 | 16 | 32,
    sampleFormat: float ? "float" : "uint",
    pages,
    integerCodes: !float && !colour,
    topCode: !float && !colour ? 2 ** first.bitsPerSample - 1 : undefined,
    format: "tiff",
    notes: colour ? ["RGB pixels averaged to grey"] : [],
  };
}

function decodePage(bytes: Uint8Array, buffer: ArrayBuffer, page: TiffPage, littleEndian: boolean, source: string, index: number): PixelArray {
  if (page.compression === 8 || page.compression === 32946) checkDeflateStrips(bytes, page, source, index);
  const raw = page.compression === 1 ? concatStrips(bytes, page) : decompress(buffer, page, source, index);
  const pixels = page.width * page.height;
  const spp = page.samplesPerPixel;
  const bytesPerSample = page.bitsPerSample / 8;
  if (raw.length < pixels * spp * bytesPerSample) {
    throw new DataError(source, `corrupt or truncated TIFF: page ${index} decodes to ${raw.length} bytes, ${pixels * spp * bytesPerSample} are needed`, "export the image again or check the copy is complete");
  }
  const view = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  // utif2 turns 16-bit samples little-endian while decompressing; uncompressed ones keep the file order.
  const le16 = page.compression === 1 ? littleEndian : true;
  const out: PixelArray = page.sampleFormat === 3 ? new Float32Array(pixels) : spp === 1 ? (bytesPerSample === 1 ? new Uint8Array(pixels) : new Uint16Array(pixels)) : new Float32Array(pixels);
  const read = page.sampleFormat === 3
    ? (at: number): number => view.getFloat32(at, littleEndian)
    : bytesPerSample === 2
      ? (at: number): number => view.getUint16(at, le16)
      : (at: number): number => raw[at] as number;
  if (spp === 1 && bytesPerSample === 1) (out as Uint8Array).set(raw.subarray(0, pixels));
  else if (spp === 1 && bytesPerSample === 2 && page.sampleFormat !== 3) {
    const o = out as Uint16Array;
    if (le16) for (let i = 0, j = 0; i < pixels; i++, j += 2) o[i] = raw[j]! | (raw[j + 1]! << 8);
    else for (let i = 0, j = 0; i < pixels; i++, j += 2) o[i] = (raw[j]! << 8) | raw[j + 1]!;
  }
  else if (spp === 1) for (let i = 0; i < pixels; i++) out[i] = read(i * bytesPerSample);
  else {
    const stride = spp * bytesPerSample;
    for (let i = 0; i < pixels; i++) {
      const at = i * stride;
      out[i] = (read(at) + read(at + bytesPerSample) + read(at + 2 * bytesPerSample)) / 3;
    }
  }
  if (page.sampleFormat === 3) {
    for (let i = 0; i < pixels; i++) {
      if (!Number.isFinite(out[i])) {
        throw new DataError(source, `page ${index} has a non-finite pixel (NaN or infinity) at column ${(i % page.width) + 1}, row ${Math.floor(i / page.width) + 1}`, "replace invalid pixels before loading, or crop them away");
      }
    }
  }
  return out;
}

function concatStrips(bytes: Uint8Array, page: TiffPage): Uint8Array {
  if (page.stripOffsets.length === 1) return bytes.subarray(page.stripOffsets[0], page.stripOffsets[0]! + page.stripByteCounts[0]!);
  const total = page.stripByteCounts.reduce((a, b) => a + b, 0);
  const out = new Uint8Array(total);
  let at = 0;
  for (let s = 0; s < page.stripOffsets.length; s++) {
    out.set(bytes.subarray(page.stripOffsets[s], page.stripOffsets[s]! + page.stripByteCounts[s]!), at);
    at += page.stripByteCounts[s]!;
  }
  return out;
}

/**
 * Inflates each Deflate strip with a ceiling of the bytes its rows hold (plus a small slack)
 * before the decoder inflates it without one: a decompression bomb stops here.
 */
function checkDeflateStrips(bytes: Uint8Array, page: TiffPage, source: string, index: number): void {
  const rowBytes = page.width * page.samplesPerPixel * (page.bitsPerSample / 8);
  page.stripOffsets.forEach((offset, s) => {
    const rows = Math.min(page.rowsPerStrip, page.height - s * page.rowsPerStrip);
    const limit = rows * rowBytes + INFLATE_SLACK_BYTES;
    try {
      inflatedSize(bytes.subarray(offset, offset + page.stripByteCounts[s]!), limit);
    } catch (error) {
      if (error instanceof InflateLimitExceeded) {
        throw new DataError(source, `page ${index}, strip ${s + 1} inflates to more than the ${formatBytes(rows * rowBytes)} its ${rows} rows hold (a decompression bomb or a corrupt file)`, "export the image again; do not load files from untrusted sources");
      }
      throw new DataError(source, `corrupt TIFF: page ${index}, strip ${s + 1} cannot be decompressed (${describe(error)})`, "export the image again, or save it without compression");
    }
  });
}

function decompress(buffer: ArrayBuffer, page: TiffPage, source: string, index: number): Uint8Array {
  // A fresh directory with only the checked fields, so utif2 reads nothing unchecked.
  const ifd: Record<string, unknown> = {
    t256: [page.width], t257: [page.height], t258: [page.bitsPerSample], t259: [page.compression],
    t262: [page.photometric], t273: page.stripOffsets, t277: [page.samplesPerPixel], t278: [page.rowsPerStrip],
    t279: page.stripByteCounts, t284: [1], t317: [page.predictor], t339: [page.sampleFormat],
  };
  try {
    UTIF.decodeImage(buffer, ifd, [ifd]);
  } catch (error) {
    if (error instanceof FringekitError) throw error;
    throw new DataError(source, `corrupt TIFF: page ${index} cannot be decompressed (${describe(error)})`, "export the image again, or save it without compression");
  }
  const data = ifd["data"];
  if (!(data instanceof Uint8Array)) throw new DataError(source, `corrupt TIFF: page ${index} has no pixel data`, "export the image again");
  return data;
}
