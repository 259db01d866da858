// Minimal TIFF writer for tests and benchmarks: 16-bit grey, little-endian, one strip per page,
// optional Deflate (node:zlib) or PackBits compression. Layout: TIFF Revision 6.0, sections 2, 9.
import { deflateSync } from "node:zlib";

/** Encodes pages of 16-bit grey pixels as a (multi-page) TIFF. */
export function writeTiff(width: number, height: number, pages: Uint16Array[], options: { compression?: "none" | "deflate" | "packbits" } = {}): Uint8Array {
  const compression = options.compression ?? "none";
  const strips = pages.map((page) => {
    const raw = new Uint8Array(page.buffer.slice(page.byteOffset, page.byteOffset + page.byteLength));
    if (compression === "deflate") return new Uint8Array(deflateSync(raw));
    if (compression === "packbits") return packBits(raw);
    return raw;
  });
  const entries = 10;
  const ifdSize = 2 + entries * 12 + 4;
  let size = 8;
  const stripAt: number[] = [];
  for (const strip of strips) { stripAt.push(size); size += strip.length + (strip.length % 2); }
  const ifdAt: number[] = [];
  for (let i = 0; i < pages.length; i++) { ifdAt.push(size); size += ifdSize; }
  const out = new Uint8Array(size);
  const view = new DataView(out.buffer);
  out.set([0x49, 0x49, 42, 0]);
  view.setUint32(4, ifdAt[0]!, true);
  strips.forEach((strip, i) => out.set(strip, stripAt[i]));
  const code = compression === "deflate" ? 8 : compression === "packbits" ? 32773 : 1;
  pages.forEach((_, i) => {
    let at = ifdAt[i]!;
    view.setUint16(at, entries, true); at += 2;
    const field = (tag: number, type: number, value: number): void => {
      view.setUint16(at, tag, true); view.setUint16(at + 2, type, true); view.setUint32(at + 4, 1, true);
      if (type === 3) view.setUint16(at + 8, value, true); else view.setUint32(at + 8, value, true);
      at += 12;
    };
    field(256, 4, width); field(257, 4, height); field(258, 3, 16); field(259, 3, code); field(262, 3, 1);
    field(273, 4, stripAt[i]!); field(277, 3, 1); field(278, 4, height); field(279, 4, strips[i]!.length); field(339, 3, 1);
    view.setUint32(at, i + 1 < pages.length ? ifdAt[i + 1]! : 0, true);
  });
  return out;
}

function packBits(raw: Uint8Array): Uint8Array {
  const out: number[] = [];
  for (let i = 0; i < raw.length; ) {
    const n = Math.min(128, raw.length - i);
    out.push(n - 1);
    for (let k = 0; k < n; k++) out.push(raw[i + k]!);
    i += n;
  }
  return Uint8Array.from(out);
}
