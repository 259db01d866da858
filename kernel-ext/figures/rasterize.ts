/**
 * PNG from the figure SVG with resvg (@resvg/resvg-js, its platform binary ships in the npm
 * package), at a chosen resolution, fonts from figureFonts(); the dpi is recorded in pHYs.
 */
import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import { promisify } from "node:util";
import * as zlib from "node:zlib";
import { figureFonts } from "./fonts.js";
import { concatBytes, crc32, setPngDpi } from "../../src/report/render/pngDensity.js";

const deflateAsync = promisify(zlib.deflate);
/** CRC-32 of the IDAT data: zlib's own where Node has it (20.15 and later), ~4 ms less for a 600 dpi figure. */
const crc = (zlib as { crc32?: (data: Uint8Array) => number }).crc32 ?? crc32;

type RenderAsync = typeof import("@resvg/resvg-js").renderAsync;
let renderAsync: RenderAsync | undefined;

/**
 * Load resvg (its native binary: tens of milliseconds). saveFigure calls this first, so that
 * svgToPng hands the drawing to resvg's thread at once and the PDF is written meanwhile.
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

/**
 * Rasterise `svg` (sized in mm) to PNG bytes at `dpi`: width = widthMm / 25.4 × dpi pixels.
 * @param widthMm physical width of the figure (mm)
 */
export async function svgToPng(svg: string, widthMm: number, dpi: number): Promise<Uint8Array> {
  if (!renderAsync) await loadRasterizer();
  const fonts = figureFonts();
  // renderAsync draws on a worker thread, so a PDF can be written meanwhile.
  const image = await renderAsync!(svg, {
    fitTo: { mode: "width", value: Math.round((widthMm / 25.4) * dpi) },
    background: "#ffffff",
    font: { fontFiles: [fonts.regular, fonts.italic], loadSystemFonts: false, defaultFontFamily: "Liberation Sans", sansSerifFamily: "Liberation Sans" },
    shapeRendering: 2,
    textRendering: 1,
  });
  return setPngDpi(await encodePng(image.pixels, image.width, image.height), dpi);
}

/**
 * An 8-bit RGBA PNG (ISO/IEC 15948:2003) of `rgba` pixels (straight alpha, rows top to
 * bottom), every row unfiltered, compressed on libuv's thread pool.
 */
export async function encodePng(rgba: Uint8Array, width: number, height: number): Promise<Uint8Array> {
  const row = 4 * width;
  if (rgba.length !== row * height) throw new RangeError(`encodePng: ${rgba.length} bytes for ${width} × ${height} RGBA pixels`);
  const raw = new Uint8Array((row + 1) * height); // filter byte 0 (None) before each row
  for (let y = 0; y < height; y++) raw.set(rgba.subarray(y * row, (y + 1) * row), y * (row + 1) + 1);
  // One output buffer large enough for a figure: no round trip to this thread per 16 KB.
  const data = await deflateAsync(raw, { level: PNG_LEVEL, chunkSize: 1 << 20 });
  const header = new Uint8Array(13);
  const view = new DataView(header.buffer);
  view.setUint32(0, width);
  view.setUint32(4, height);
  header.set([8, 6, 0, 0, 0], 8); // 8 bits, RGBA, deflate, adaptive filtering, no interlace
  const parts = [Uint8Array.of(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a), chunk("IHDR", header), chunk("IDAT", data), chunk("IEND", new Uint8Array(0))];
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
