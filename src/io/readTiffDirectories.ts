/**
 * TIFF structure check: walks the image file directories (IFDs) with bounds, cycle and size
 * checks before any pixel is decoded, so a corrupt or hostile file gives a clear error in
 * bounded time. Format: TIFF Revision 6.0 (Adobe, 1992), sections 2 and 8.
 */
import { DataError } from "../errors.js";
import { formatBytes, MAX_DECODED_IMAGE_BYTES, MAX_IMAGE_PIXELS } from "./limits.js";

/** The baseline fields of one page that the decoder needs. */
export interface TiffPage {
  width: number;
  height: number;
  bitsPerSample: number;
  samplesPerPixel: number;
  /** 1 unsigned integer, 2 signed integer, 3 IEEE float (TIFF tag 339). */
  sampleFormat: number;
  /** 1 none, 5 LZW, 8/32946 Deflate, 32773 PackBits (tag 259). */
  compression: number;
  /** 0 WhiteIsZero, 1 BlackIsZero, 2 RGB (tag 262). */
  photometric: number;
  predictor: number;
  rowsPerStrip: number;
  stripOffsets: number[];
  stripByteCounts: number[];
}

/** Byte order and pages of a TIFF file. */
export interface TiffStructure {
  littleEndian: boolean;
  pages: TiffPage[];
}

const TYPE_SIZE = [0, 1, 1, 2, 4, 8, 1, 1, 2, 4, 8, 4, 8, 4];
const MAX_PAGES = 100_000;

/** True when the bytes start with a TIFF header ("II*\0" or "MM\0*"). */
export function isTiff(bytes: Uint8Array): boolean {
  return bytes.length >= 4 && ((bytes[0] === 0x49 && bytes[1] === 0x49 && bytes[2] === 42 && bytes[3] === 0) || (bytes[0] === 0x4d && bytes[1] === 0x4d && bytes[2] === 0 && bytes[3] === 42));
}

/**
 * Reads and checks every IFD of a TIFF file.
 * @param bytes  the file
 * @param source file name for messages
 */
export function readTiffDirectories(bytes: Uint8Array, source: string): TiffStructure {
  const corrupt = (what: string): DataError => new DataError(source, `corrupt or truncated TIFF: ${what}`, "export the image again or check the copy is complete");
  if (bytes.length >= 4 && ((bytes[0] === 0x49 && bytes[2] === 43) || (bytes[0] === 0x4d && bytes[3] === 43))) {
    throw new DataError(source, "BigTIFF files are not supported", "save the stack as classic TIFF (below 4 GiB)");
  }
  if (!isTiff(bytes)) throw new DataError(source, "not a TIFF file (wrong header)", "give a PNG, a TIFF or a text table");
  if (bytes.length < 8) throw corrupt("the file ends inside the header");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const le = bytes[0] === 0x49;
  const u16 = (at: number): number => view.getUint16(at, le);
  const u32 = (at: number): number => view.getUint32(at, le);
  const pages: TiffPage[] = [];
  const seen = new Set<number>();
  let offset = u32(4);
  let pixels = 0;
  let decodedBytes = 0;
  while (offset !== 0) {
    if (seen.has(offset)) throw corrupt(`directory chain loops back to offset ${offset}`);
    if (pages.length >= MAX_PAGES) throw new DataError(source, `more than ${MAX_PAGES} pages`, "split the stack");
    seen.add(offset);
    if (offset + 2 > bytes.length) throw corrupt(`directory offset ${offset} is beyond the end of the file (${bytes.length} bytes)`);
    const count = u16(offset);
    const end = offset + 2 + count * 12;
    if (end + 4 > bytes.length) throw corrupt(`directory at offset ${offset} runs past the end of the file`);
    const tags = new Map<number, number[]>();
    for (let i = 0; i < count; i++) {
      const entry = offset + 2 + i * 12;
      const tag = u16(entry);
      const type = u16(entry + 2);
      const n = u32(entry + 4);
      const size = TYPE_SIZE[type];
      if (size === undefined || size === 0) continue; // unknown field types are skipped (TIFF 6.0 §2)
      const total = size * n;
      const at = total <= 4 ? entry + 8 : u32(entry + 8);
      if (at + total > bytes.length) throw corrupt(`field ${tag} points beyond the end of the file`);
      if (NEEDED.has(tag)) {
        if (n > 1_000_000) throw corrupt(`field ${tag} has ${n} values`);
        const values: number[] = [];
        for (let k = 0; k < n; k++) values.push(type === 3 ? u16(at + 2 * k) : type === 4 ? u32(at + 4 * k) : type === 1 ? (bytes[at + k] as number) : NaN);
        tags.set(tag, values);
      }
    }
    pages.push(pageFrom(tags, source, pages.length + 1, bytes.length, corrupt));
    const page = pages[pages.length - 1]!;
    pixels += page.width * page.height;
    if (pixels > MAX_IMAGE_PIXELS) throw new DataError(source, `the image stack holds more than ${MAX_IMAGE_PIXELS} pixels`, "crop the frames or split the stack");
    decodedBytes += page.width * page.height * page.samplesPerPixel * (page.bitsPerSample / 8);
    if (decodedBytes > MAX_DECODED_IMAGE_BYTES) {
      throw new DataError(source, `the image stack decodes to more than ${formatBytes(MAX_DECODED_IMAGE_BYTES)} (pixels × channels × bytes per sample, up to page ${pages.length})`, "crop the frames, split the stack or save it as greyscale");
    }
    offset = u32(end);
  }
  if (pages.length === 0) throw corrupt("no image directory");
  checkStripsDisjoint(pages, corrupt);
  return { littleEndian: le, pages };
}

/**
 * Throws when two strips (of any pages) share bytes: a legitimate file stores each strip once;
 * aliased strips make a small file decode to many times its size.
 */
function checkStripsDisjoint(pages: readonly TiffPage[], corrupt: (what: string) => DataError): void {
  const ranges: [number, number, number, number][] = [];
  pages.forEach((page, p) => page.stripOffsets.forEach((start, s) => {
    const count = page.stripByteCounts[s]!;
    if (count > 0) ranges.push([start, start + count, p + 1, s + 1]);
  }));
  ranges.sort((a, b) => a[0] - b[0]);
  for (let i = 1; i < ranges.length; i++) {
    const [start, , page, strip] = ranges[i]!;
    const [, previousEnd, previousPage, previousStrip] = ranges[i - 1]!;
    if (start < previousEnd) throw corrupt(`strip ${strip} of page ${page} overlaps strip ${previousStrip} of page ${previousPage} (strips must not share bytes)`);
  }
}

const NEEDED = new Set([256, 257, 258, 259, 262, 273, 277, 278, 279, 284, 317, 322, 339]);

function pageFrom(tags: Map<number, number[]>, source: string, index: number, fileLength: number, corrupt: (what: string) => DataError): TiffPage {
  const one = (tag: number, fallback?: number): number => {
    const value = tags.get(tag)?.[0] ?? fallback;
    if (value === undefined || !Number.isFinite(value)) throw corrupt(`page ${index} lacks field ${tag}`);
    return value;
  };
  const unsupported = (what: string, hint: string): DataError => new DataError(source, `page ${index}: ${what} is not supported`, hint);
  const width = one(256);
  const height = one(257);
  if (width === 0 || height === 0) throw corrupt(`page ${index} has size ${width} × ${height}`);
  const bits = tags.get(258) ?? [1];
  const bitsPerSample = bits[0] as number;
  const samplesPerPixel = one(277, 1);
  const sampleFormat = one(339, 1);
  const compression = one(259, 1);
  const photometric = one(262, 1);
  const predictor = one(317, 1);
  if (tags.has(322)) throw unsupported("a tiled TIFF", "save the frames as strips (the default of most programs)");
  if (one(284, 1) !== 1) throw unsupported("planar configuration 2 (separate colour planes)", "save as interleaved (chunky) pixels");
  if (bits.some((b) => b !== bitsPerSample)) throw unsupported("different bit depths per channel", "save as greyscale");
  if (![1, 3, 4].includes(samplesPerPixel)) throw unsupported(`${samplesPerPixel} samples per pixel`, "save as greyscale or RGB");
  if (![1, 2].includes(photometric)) throw unsupported(`photometric interpretation ${photometric}`, "save as greyscale (black is zero) or RGB");
  const type = `${bitsPerSample}-bit ${sampleFormat === 3 ? "float" : sampleFormat === 2 ? "signed integer" : "integer"}`;
  const ok = (sampleFormat === 1 && (bitsPerSample === 8 || bitsPerSample === 16)) || (sampleFormat === 3 && bitsPerSample === 32);
  if (!ok) throw unsupported(`a ${type} image`, "save as 8- or 16-bit unsigned integer or 32-bit float");
  if (![1, 5, 8, 32946, 32773].includes(compression)) throw unsupported(`compression ${compression}`, "save without compression, or with LZW, Deflate or PackBits");
  if (predictor !== 1 && !(predictor === 2 && bitsPerSample !== 32)) throw unsupported(`predictor ${predictor} with a ${type} image`, "save without a predictor");
  const stripOffsets = tags.get(273);
  const stripByteCounts = tags.get(279);
  if (!stripOffsets || !stripByteCounts) throw corrupt(`page ${index} has no strip offsets or byte counts`);
  if (stripOffsets.length !== stripByteCounts.length) throw corrupt(`page ${index} has ${stripOffsets.length} strip offsets but ${stripByteCounts.length} byte counts`);
  const rowsPerStrip = Math.min(one(278, height), height);
  if (rowsPerStrip === 0) throw corrupt(`page ${index} has zero rows per strip`);
  // TIFF 6.0 §3 (StripsPerImage): exactly ceil(height / rowsPerStrip) strips for chunky pixels.
  const strips = Math.ceil(height / rowsPerStrip);
  if (stripOffsets.length !== strips) throw corrupt(`page ${index} has ${stripOffsets.length} strips for ${height} rows of ${rowsPerStrip} (${strips} expected)`);
  for (let s = 0; s < stripOffsets.length; s++) {
    if ((stripOffsets[s] as number) + (stripByteCounts[s] as number) > fileLength) {
      throw corrupt(`page ${index}: strip ${s + 1} ends at byte ${(stripOffsets[s] as number) + (stripByteCounts[s] as number)}, beyond the end of the file (${fileLength} bytes)`);
    }
  }
  if (compression === 1) {
    const rowBytes = width * samplesPerPixel * (bitsPerSample / 8);
    const total = stripByteCounts.reduce((a, b) => a + b, 0);
    if (total < rowBytes * height) throw corrupt(`page ${index} holds ${total} pixel bytes, ${rowBytes * height} are needed`);
  }
  return { width, height, bitsPerSample, samplesPerPixel, sampleFormat, compression, photometric, predictor, rowsPerStrip, stripOffsets, stripByteCounts };
}
