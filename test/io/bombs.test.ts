// readImage(hostile image) in bounded time and memory: decompression bombs (PNG IDAT, PNG
// iCCP, Deflate TIFF strips), a header whose channels × bytes per sample exceed the decoded-size
// limit, and TIFF strips that alias one block. Each file is generated here (they are large when
// inflated, small on disk) and read in a child process whose peak RSS and time are checked.
// Formats: PNG (ISO/IEC 15948), TIFF 6.0, zlib (RFC 1950) / DEFLATE (RFC 1951); bombs made with
// Node's zlib, independent of the decoders under test.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import zlib from "node:zlib";
import { afterAll, describe, expect, it } from "vitest";

const MiB = 1024 * 1024;
const dir = mkdtempSync(path.join(tmpdir(), "fk-bombs-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A zlib stream of `mebibytes` MiB of zeros, built from one repeated full-flush block (~1 KiB per MiB). */
function zeroBomb(mebibytes: number): Buffer {
  const piece = zlib.deflateRawSync(Buffer.alloc(MiB), { level: 9, finishFlush: zlib.constants.Z_FULL_FLUSH });
  const last = zlib.deflateRawSync(Buffer.alloc(0));
  const adler = Buffer.alloc(4);
  adler.writeUInt32BE(((((mebibytes * MiB) % 65521) << 16) | 1) >>> 0); // Adler-32 of n zeros: a = 1, b = n mod 65521 (RFC 1950 §8)
  return Buffer.concat([Buffer.from([0x78, 0xda]), ...Array.from({ length: mebibytes }, () => piece), last, adler]);
}

const crc = (buf: Buffer) => zlib.crc32(buf) >>> 0;
function chunk(type: string, body: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(body.length, 0);
  head.write(type, 4, "latin1");
  const tail = Buffer.alloc(4);
  tail.writeUInt32BE(crc(Buffer.concat([Buffer.from(type, "latin1"), body])));
  return Buffer.concat([head, body, tail]);
}
function png(width: number, height: number, depth: number, colour: number, idat: Buffer, extra: Buffer[] = []): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0); ihdr.writeUInt32BE(height, 4); ihdr[8] = depth; ihdr[9] = colour;
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk("IHDR", ihdr), ...extra, chunk("IDAT", idat), chunk("IEND", Buffer.alloc(0))]);
}

/** Little-endian TIFF, 8-bit grey, one page: strips given as (offset, count) into `data` placed at byte 8. */
function tiff(width: number, height: number, rowsPerStrip: number, compression: number, data: Buffer, strips: [number, number][]): Buffer {
  const n = strips.length;
  const dataAt = 8;
  const offsetsAt = dataAt + data.length;
  const countsAt = offsetsAt + 4 * n;
  const ifdAt = countsAt + 4 * n;
  const entries: [number, number, number, number][] = [
    [256, 4, 1, width], [257, 4, 1, height], [258, 3, 1, 8], [259, 3, 1, compression], [262, 3, 1, 1],
    [273, 4, n, n === 1 ? dataAt + strips[0]![0] : offsetsAt], [277, 3, 1, 1], [278, 4, 1, rowsPerStrip], [279, 4, n, n === 1 ? strips[0]![1] : countsAt],
  ];
  const out = Buffer.alloc(ifdAt + 2 + entries.length * 12 + 4);
  out.write("II*\0", 0, "latin1");
  out.writeUInt32LE(ifdAt, 4);
  data.copy(out, dataAt);
  strips.forEach(([o, c], i) => { out.writeUInt32LE(dataAt + o, offsetsAt + 4 * i); out.writeUInt32LE(c, countsAt + 4 * i); });
  out.writeUInt16LE(entries.length, ifdAt);
  entries.forEach(([tag, type, count, value], i) => {
    const at = ifdAt + 2 + 12 * i;
    out.writeUInt16LE(tag, at); out.writeUInt16LE(type, at + 2); out.writeUInt32LE(count, at + 4);
    if (type === 3 && count === 1) out.writeUInt16LE(value, at + 8); else out.writeUInt32LE(value, at + 8);
  });
  return out;
}

/** Reads `bytes` in a child process; returns its message, time (ms) and peak RSS (MiB). */
function readInChild(name: string, bytes: Buffer): { message: string; ms: number; maxRssMiB: number } {
  const file = path.join(dir, name);
  writeFileSync(file, bytes);
  const child = fileURLToPath(new URL("./decodeChild.ts", import.meta.url));
  const result = spawnSync(process.execPath, ["--import", "tsx", child, file], { encoding: "utf8", timeout: 120_000, cwd: fileURLToPath(new URL("../../", import.meta.url)) });
  if (result.status !== 0) throw new Error(`child failed (${result.signal ?? result.status}): ${result.stderr.slice(0, 500)}`);
  return JSON.parse(result.stdout.trim().split("\n").pop()!);
}

// Generous bounds for a loaded 2-core machine; each bomb would need ≥ 1 GiB and tens of seconds.
const MAX_MS = 15_000;
const MAX_RSS_MIB = 450;

describe("readImage(bomb) refuses in bounded time and memory", () => {
  const cases: [string, () => Buffer, RegExp][] = [
    ["idat-bomb.png: 1×1 grey whose IDAT inflates to 1 GiB", () => png(1, 1, 8, 0, zeroBomb(1024)), /inflate to more than .* header implies/],
    ["iccp-bomb.png: a valid 1×1 image with an iCCP chunk inflating to 1 GiB", () => {
      const iccp = Buffer.concat([Buffer.from("icc\0\0", "latin1"), zeroBomb(1024)]);
      return png(1, 1, 8, 0, zlib.deflateSync(Buffer.from([0, 7])), [chunk("iCCP", iccp)]);
    }, /^accepted$/],
    ["rgba16.png: 16384² RGBA 16-bit (2 GiB decoded) in a small file", () => png(16384, 16384, 16, 6, zeroBomb(4)), /16384 × 16384 pixels × 4 channel\(s\) × 2 byte\(s\), 2\.0 GiB decoded, above the 512 MiB limit/],
    ["deflate-bomb.tif: 1×1 grey, one Deflate strip inflating to 1 GiB", () => { const z = zeroBomb(1024); return tiff(1, 1, 1, 8, z, [[0, z.length]]); }, /strip 1 inflates to more than/],
    ["aliased-strips.tif: 999 999 uncompressed strips all pointing at one 4 KiB block", () => tiff(1, 999_999, 1, 1, Buffer.alloc(4096, 7), Array.from({ length: 999_999 }, () => [0, 4096] as [number, number])), /overlaps strip/],
    ["shared-stream.tif: 200 000 Deflate strips sharing one stream", () => { const z = zeroBomb(1); return tiff(1, 200_000, 1, 8, z, Array.from({ length: 200_000 }, () => [0, z.length] as [number, number])); }, /overlaps strip/],
  ];
  for (const [title, make, expected] of cases) {
    it(`readImage(${title})`, () => {
      const { message, ms, maxRssMiB } = readInChild(title.split(":")[0]!, make());
      expect(message).toMatch(expected);
      expect(message).not.toContain("\n");
      expect(ms).toBeLessThan(MAX_MS);
      expect(maxRssMiB).toBeLessThan(MAX_RSS_MIB);
    }, 180_000);
  }
});
