/**
 * PNG of a figure scene with resvg (@resvg/resvg-js, its platform binary ships in the npm
 * package), at a chosen resolution, fonts from figureFonts(); the dpi is recorded in pHYs.
 */
import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import { availableParallelism } from "node:os";
import { promisify } from "node:util";
import * as zlib from "node:zlib";
import type { Scene } from "../../src/report/render/scene.js";
import { figureFonts } from "./fonts.js";
import { planRasterBands } from "./rasterBands.js";
import { concatBytes, crc32, setPngDpi } from "../../src/report/render/pngDensity.js";

const deflateAsync = promisify(zlib.deflate);
/** CRC-32 of the IDAT data: zlib's own where Node has it (20.15 and later), ~4 ms less for a 600 dpi figure. */
const crc = (zlib as { crc32?: (data: Uint8Array) => number }).crc32 ?? crc32;

type RenderAsync = typeof import("@resvg/resvg-js").renderAsync;
let renderAsync: RenderAsync | undefined;

/**
 * Load resvg (its native binary: tens of milliseconds). saveFigure calls this first, so that
 * sceneToPng hands the drawing to resvg's threads at once and the PDF is written meanwhile.
 */
export async function loadRasterizer(): Promise<void> {
  renderAsync ??= directBinding() ?? (await import("@resvg/resvg-js")).renderAsync;
}

/**
 * On glibc Linux, resvg's binary package loaded directly: the package's own loader first asks
 * process.report for the C library, ~10 ms of a ~0.3 s export (bench/B7). The call is the
 * one the package's index.js makes (options as JSON). Anything unexpected: undefined, and the
 * package's loader is used.
 */
function directBinding(): RenderAsync | undefined {
  const arch = process.arch === "x64" ? "x86_64" : process.arch === "arm64" ? "aarch64" : undefined;
  if (process.platform !== "linux" || !arch || existsSync(`/lib/ld-musl-${arch}.so.1`)) return undefined;
  try {
    const fromPackage = createRequire(createRequire(import.meta.url).resolve("@resvg/resvg-js"));
    const binding = fromPackage(`@resvg/resvg-js-linux-${process.arch}-gnu`) as { renderAsync?: (svg: string, options: string | null, signal?: AbortSignal) => ReturnType<RenderAsync> };
    const render = binding.renderAsync;
    if (typeof render !== "function") return undefined;
    return ((svg, options, signal) => render(svg as string, options ? JSON.stringify(options) : null, signal ?? undefined)) as RenderAsync;
  } catch {
    return undefined;
  }
}

/**
 * zlib level of the image data. Figures are mostly white with few colours: level 3 with
 * unfiltered rows is ~4× faster than resvg's own encoder at a similar size (bench/B7;
 * 600 dpi fit figure: 12 ms, 240 KB against 50 ms, 250 KB), and runs off the main thread.
 */
const PNG_LEVEL = 3;

/** resvg's options for drawing a band document at its own pixel size with the figure fonts. */
function renderOptions() {
  const fonts = figureFonts();
  return {
    fitTo: { mode: "original" as const },
    background: "#ffffff",
    font: { fontFiles: [fonts.regular, fonts.italic], loadSystemFonts: false, defaultFontFamily: "Liberation Sans", sansSerifFamily: "Liberation Sans" },
    shapeRendering: 2 as const,
    textRendering: 1 as const,
  };
}

/**
 * Rasterise a figure scene to PNG bytes at `dpi` (width = widthMm / 25.4 × dpi pixels, height
 * in the scene's proportion). The figure is drawn in horizontal bands on resvg's threads at
 * once (rasterBands.ts: one band per panel group when that pays), each band compressed as soon
 * as it is drawn; the pixels are those of one drawing of the whole figure.
 * @param scene a figure scene (src/report/render)
 * @param dpi resolution (dots per inch), recorded in the PNG's pHYs chunk
 * @param maxBands most bands drawn at once (default: 2, or 1 on a one-CPU machine)
 */
export async function sceneToPng(scene: Scene, dpi: number, maxBands = Math.min(2, availableParallelism())): Promise<Uint8Array> {
  if (!renderAsync) await loadRasterizer();
  const width = Math.round((scene.widthMm / 25.4) * dpi);
  const height = Math.max(1, Math.round((width * scene.heightMm) / scene.widthMm));
  const bands = planRasterBands(scene, width, height, maxBands);
  const drawn = await Promise.all(bands.map(async (band) => {
    const image = await renderAsync!(band.svg, renderOptions());
    if (image.width !== width || image.height !== band.rows) throw new Error(`PNG band drawn ${image.width} × ${image.height} px, expected ${width} × ${band.rows}`);
    const pixels = image.pixels;
    return { pixels, piece: await compressRows(pixels, width, band.rows) };
  }));
  const pieces = drawn.map((d) => d.piece);
  if (pieces.every((p): p is CompressedRows => p !== undefined)) return setPngDpi(assemblePng(width, height, joinZlib(pieces)), dpi);
  return setPngDpi(await encodePng(concatBytes(drawn.map((d) => d.pixels)), width, height), dpi);
}

/**
 * An 8-bit RGBA PNG (ISO/IEC 15948:2003) of `rgba` pixels (straight alpha, rows top to
 * bottom), every row unfiltered, compressed on libuv's thread pool.
 */
export async function encodePng(rgba: Uint8Array, width: number, height: number): Promise<Uint8Array> {
  // One output buffer large enough for a figure: no round trip to this thread per 16 KB.
  return assemblePng(width, height, await deflateAsync(filteredRows(rgba, width, height), { level: PNG_LEVEL, chunkSize: 1 << 20 }));
}

/** Deflate blocks of some rows, ended by a sync flush (byte-aligned, not final), and the Adler-32 of those bytes. */
interface CompressedRows {
  data: Uint8Array;
  adler: number;
  length: number;
}

/** What zlib writes on finishing right after a sync flush: the flush's empty stored block, then an empty final block. */
const SYNC_THEN_FINAL = [0x00, 0x00, 0xff, 0xff, 0x03, 0x00];

/**
 * Compress rows of RGBA pixels, each preceded by filter byte 0 (None), as a piece of a zlib
 * stream (RFC 1950/1951) that can be joined to pieces compressed apart (on other threads): the
 * deflate blocks up to a sync flush, and the piece's Adler-32, which zlib writes at the end.
 * @returns undefined when zlib's output does not end as expected (the caller then compresses the whole image in one stream)
 */
async function compressRows(rgba: Uint8Array, width: number, rows: number): Promise<CompressedRows | undefined> {
  const raw = filteredRows(rgba, width, rows);
  const stream = zlib.createDeflate({ level: PNG_LEVEL, chunkSize: 1 << 20 });
  const chunks: Buffer[] = [];
  stream.on("data", (chunk: Buffer) => chunks.push(chunk));
  const finished = new Promise<void>((resolve, reject) => { stream.on("end", resolve); stream.on("error", reject); });
  stream.write(raw);
  // end() only once the flush is done: a flush still queued when the stream ends is turned into the finish.
  await new Promise<void>((resolve) => stream.flush(zlib.constants.Z_SYNC_FLUSH, resolve));
  stream.end();
  await finished;
  const out = concatBytes(chunks), n = out.length;
  // header (2) … 00 00 ff ff | 03 00 | Adler-32 (4): keep the blocks through the flush marker.
  if (n < 12 || SYNC_THEN_FINAL.some((byte, i) => out[n - 10 + i] !== byte)) return undefined;
  return { data: out.subarray(2, n - 6), adler: new DataView(out.buffer, out.byteOffset, n).getUint32(n - 4), length: raw.length };
}

/** The PNG scanlines of `rows` rows of RGBA pixels: filter byte 0 (None), then the row. */
function filteredRows(rgba: Uint8Array, width: number, rows: number): Uint8Array {
  const row = 4 * width;
  if (rgba.length !== row * rows) throw new RangeError(`encodePng: ${rgba.length} bytes for ${width} × ${rows} RGBA pixels`);
  const raw = new Uint8Array((row + 1) * rows);
  for (let y = 0; y < rows; y++) raw.set(rgba.subarray(y * row, (y + 1) * row), y * (row + 1) + 1);
  return raw;
}

/**
 * One zlib stream from pieces compressed apart: header, the pieces' deflate blocks in order,
 * an empty final block, and the Adler-32 of the whole (combined as zlib's adler32_combine).
 */
function joinZlib(pieces: CompressedRows[]): Uint8Array {
  let adler = 1;
  for (const piece of pieces) adler = adler32Combine(adler, piece.adler, piece.length);
  const trailer = new Uint8Array(4);
  new DataView(trailer.buffer).setUint32(0, adler);
  // 0x78 0x5e: deflate, 32 KB window, "fast" level flag, header check (RFC 1950 §2.2);
  // 0x03 0x00: a final fixed-Huffman block holding only its end code.
  return concatBytes([Uint8Array.of(0x78, 0x5e), ...pieces.map((p) => p.data), Uint8Array.of(0x03, 0x00), trailer]);
}

/** Adler-32 of A followed by B from adler32(A), adler32(B) and B's length (zlib's adler32_combine). */
export function adler32Combine(adlerA: number, adlerB: number, lengthB: number): number {
  const BASE = 65521;
  const rem = lengthB % BASE;
  let sum1 = adlerA & 0xffff;
  let sum2 = (rem * sum1) % BASE;
  sum1 += (adlerB & 0xffff) + BASE - 1;
  sum2 += ((adlerA >>> 16) & 0xffff) + ((adlerB >>> 16) & 0xffff) + BASE - rem;
  if (sum1 >= BASE) sum1 -= BASE;
  if (sum1 >= BASE) sum1 -= BASE;
  if (sum2 >= 2 * BASE) sum2 -= 2 * BASE;
  if (sum2 >= BASE) sum2 -= BASE;
  return ((sum2 << 16) | sum1) >>> 0;
}

/** PNG signature, IHDR (8-bit RGBA, no interlace), one IDAT with `zlibData`, IEND. */
function assemblePng(width: number, height: number, zlibData: Uint8Array): Uint8Array {
  const header = new Uint8Array(13);
  const view = new DataView(header.buffer);
  view.setUint32(0, width);
  view.setUint32(4, height);
  header.set([8, 6, 0, 0, 0], 8); // 8 bits, RGBA, deflate, adaptive filtering, no interlace
  const parts = [Uint8Array.of(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a), chunk("IHDR", header), chunk("IDAT", zlibData), chunk("IEND", new Uint8Array(0))];
  return concatBytes(parts);
}

/** A PNG chunk: length, type, data, CRC-32 of type and data. */
function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc(out.subarray(4, 8 + data.length)));
  return out;
}
