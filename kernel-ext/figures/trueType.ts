/**
 * Just enough of a TrueType reader to embed a font in a PDF: character → glyph (cmap format 4),
 * advance widths (hmtx), the numbers a PDF font descriptor needs, and a subset holding only the
 * glyphs a figure draws (renumbered from 1, composite glyphs with their components).
 * Table layouts: OpenType specification 1.9 (Microsoft), chapters "cmap", "glyf", "head",
 * "hhea", "hmtx", "loca", "maxp", "name", "OS/2", "post". Reading the file costs about a
 * millisecond; a general font library costs a hundred times that to load (see bench/B7).
 */
import { FringekitError } from "../../src/errors.js";

/** A parsed TrueType font (glyph outlines in the "glyf" table). */
export interface TrueTypeFont {
  /** PostScript name (name table, id 6), e.g. "LiberationSans-Italic". */
  postScriptName: string;
  /** Font design units per em. */
  unitsPerEm: number;
  /** Typographic ascent and descent (hhea), bounding box of all glyphs (head), cap height (OS/2), in font units. */
  ascent: number;
  descent: number;
  capHeight: number;
  bbox: [number, number, number, number];
  /** Slant of upright strokes, degrees counter-clockwise from vertical (post). */
  italicAngle: number;
  /** Glyph index of a Unicode code point; 0 (.notdef) when the font has none. */
  glyphOf(codePoint: number): number;
  /** Advance width of glyph `gid` in font units. */
  advance(gid: number): number;
}

/** A subset font: its file bytes and, for each original glyph index kept, its new index. */
export interface TrueTypeSubset {
  bytes: Uint8Array;
  newIndex: Map<number, number>;
}

/** Tables a PDF viewer needs from an embedded TrueType font (ISO 32000-1 §9.9 lists these). */
const SUBSET_TABLES = ["cvt ", "fpgm", "glyf", "head", "hhea", "hmtx", "loca", "maxp", "prep"] as const;

interface Tables {
  bytes: Uint8Array;
  view: DataView;
  table: Map<string, { offset: number; length: number }>;
}

/**
 * Read a TrueType font file (the "glyf" flavour; CFF-based OpenType is refused).
 * @param where the file's name, for the error message
 * @throws FringekitError "bad-font" naming the table that is missing or unreadable
 */
export function parseTrueType(bytes: Uint8Array, where: string): TrueTypeFont & { subset(glyphs: Iterable<number>): TrueTypeSubset } {
  const fail = (what: string): never => {
    throw new FringekitError("bad-font", `${where} is not a TrueType font fringekit can embed (${what}); point FRINGEKIT_FONT_DIR at Debian's fonts-liberation files`);
  };
  if (bytes.length < 12) fail("file too short");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint32(0);
  if (version !== 0x00010000 && version !== 0x74727565) fail("not a TrueType outline font");
  const table = new Map<string, { offset: number; length: number }>();
  const count = view.getUint16(4);
  for (let i = 0; i < count; i++) {
    const at = 12 + 16 * i;
    const tag = String.fromCharCode(bytes[at]!, bytes[at + 1]!, bytes[at + 2]!, bytes[at + 3]!);
    const offset = view.getUint32(at + 8), length = view.getUint32(at + 12);
    if (offset + length > bytes.length) fail(`table ${tag} runs past the end of the file`);
    table.set(tag, { offset, length });
  }
  for (const tag of [...SUBSET_TABLES.filter((t) => t !== "cvt " && t !== "fpgm" && t !== "prep"), "cmap"]) if (!table.has(tag)) fail(`no ${tag.trim()} table`);
  const t: Tables = { bytes, view, table };
  const at = (tag: string) => table.get(tag)!.offset;

  const head = at("head");
  const unitsPerEm = view.getUint16(head + 18);
  const bbox: [number, number, number, number] = [view.getInt16(head + 36), view.getInt16(head + 38), view.getInt16(head + 40), view.getInt16(head + 42)];
  const longLoca = view.getInt16(head + 50) === 1;
  const hhea = at("hhea");
  const ascent = view.getInt16(hhea + 4), descent = view.getInt16(hhea + 6);
  const hMetrics = view.getUint16(hhea + 34);
  const numGlyphs = view.getUint16(at("maxp") + 4);
  const hmtx = at("hmtx");
  const os2 = table.get("OS/2");
  const capHeight = os2 && view.getUint16(os2.offset) >= 2 && os2.length >= 90 ? view.getInt16(os2.offset + 88) : Math.round(ascent * 0.7);
  const post = table.get("post");
  const italicAngle = post ? view.getInt32(post.offset + 4) / 65536 : 0;
  const cmap = readCmap(t, fail);
  const loca = at("loca");
  const glyphRange = (gid: number): [number, number] =>
    longLoca ? [view.getUint32(loca + 4 * gid), view.getUint32(loca + 4 * gid + 4)] : [2 * view.getUint16(loca + 2 * gid), 2 * view.getUint16(loca + 2 * gid + 2)];

  const font = {
    postScriptName: readPostScriptName(t) ?? where.replace(/^.*[\\/]/, "").replace(/\.[^.]*$/, ""),
    unitsPerEm, ascent, descent, capHeight, bbox, italicAngle,
    glyphOf: (codePoint: number) => {
      const gid = cmap(codePoint);
      return gid < numGlyphs ? gid : 0;
    },
    advance: (gid: number) => view.getUint16(hmtx + 4 * Math.min(gid, hMetrics - 1)),
    subset: (glyphs: Iterable<number>) => subsetFont(t, { numGlyphs, hMetrics, glyphRange }, glyphs),
  };
  return font;
}

/** Unicode → glyph lookup from the Windows Unicode BMP subtable (platform 3, encoding 1, format 4). */
function readCmap({ view, table }: Tables, fail: (what: string) => never): (codePoint: number) => number {
  const cmap = table.get("cmap")!.offset;
  let sub = -1;
  for (let i = 0; i < view.getUint16(cmap + 2); i++) {
    const rec = cmap + 4 + 8 * i;
    const platform = view.getUint16(rec), encoding = view.getUint16(rec + 2);
    const offset = cmap + view.getUint32(rec + 4);
    if (view.getUint16(offset) !== 4) continue;
    if ((platform === 3 && encoding === 1) || (platform === 0 && sub < 0)) sub = offset;
  }
  if (sub < 0) fail("no Unicode cmap subtable of format 4");
  const segments = view.getUint16(sub + 6) / 2;
  const ends = sub + 14, starts = ends + 2 * segments + 2, deltas = starts + 2 * segments, ranges = deltas + 2 * segments;
  return (c: number) => {
    if (c > 0xffff) return 0;
    for (let s = 0; s < segments; s++) {
      if (c > view.getUint16(ends + 2 * s)) continue;
      const start = view.getUint16(starts + 2 * s);
      if (c < start) return 0;
      const delta = view.getUint16(deltas + 2 * s);
      const rangeAt = ranges + 2 * s, range = view.getUint16(rangeAt);
      if (range === 0) return (c + delta) & 0xffff;
      const g = view.getUint16(rangeAt + range + 2 * (c - start));
      return g === 0 ? 0 : (g + delta) & 0xffff;
    }
    return 0;
  };
}

/** The PostScript name (id 6) from a Windows (UTF-16BE) or Macintosh (Roman) name record. */
function readPostScriptName({ bytes, view, table }: Tables): string | undefined {
  const name = table.get("name");
  if (!name) return undefined;
  const base = name.offset, strings = base + view.getUint16(base + 4);
  for (let i = 0; i < view.getUint16(base + 2); i++) {
    const rec = base + 6 + 12 * i;
    if (view.getUint16(rec + 6) !== 6) continue;
    const platform = view.getUint16(rec), length = view.getUint16(rec + 8), at = strings + view.getUint16(rec + 10);
    let text = "";
    if (platform === 3 || platform === 0) for (let k = 0; k + 1 < length; k += 2) text += String.fromCharCode(view.getUint16(at + k));
    else for (let k = 0; k < length; k++) text += String.fromCharCode(bytes[at + k]!);
    // PostScript names are printable ASCII without delimiters (Adobe Technical Note #5902).
    text = text.replace(/[^\x21-\x7e]|[[\](){}<>/%]/g, "");
    if (text) return text;
  }
  return undefined;
}

interface GlyphIndex {
  numGlyphs: number;
  hMetrics: number;
  glyphRange(gid: number): [number, number];
}

/** Composite glyph flags (OpenType "glyf": component glyph flags). */
const ARG_1_AND_2_ARE_WORDS = 0x1, WE_HAVE_A_SCALE = 0x8, MORE_COMPONENTS = 0x20, WE_HAVE_AN_X_AND_Y_SCALE = 0x40, WE_HAVE_A_TWO_BY_TWO = 0x80;

/** Offsets (within the glyph) of the component glyph indices of a composite glyph; none for a simple one. */
function componentOffsets(view: DataView, start: number, end: number): number[] {
  if (end - start < 10 || view.getInt16(start) >= 0) return [];
  const out: number[] = [];
  let at = start + 10;
  for (;;) {
    const flags = view.getUint16(at);
    out.push(at + 2 - start);
    at += 4 + (flags & ARG_1_AND_2_ARE_WORDS ? 4 : 2);
    if (flags & WE_HAVE_A_SCALE) at += 2;
    else if (flags & WE_HAVE_AN_X_AND_Y_SCALE) at += 4;
    else if (flags & WE_HAVE_A_TWO_BY_TWO) at += 8;
    if (!(flags & MORE_COMPONENTS) || at + 4 > end) return out;
  }
}

/**
 * A font file with glyph 0 (.notdef), `glyphs` and the components they are built from,
 * renumbered 0, 1, 2 … in that order; long loca offsets; hinting tables kept.
 */
function subsetFont({ bytes, view, table }: Tables, index: GlyphIndex, glyphs: Iterable<number>): TrueTypeSubset {
  const glyf = table.get("glyf")!.offset;
  const newIndex = new Map<number, number>([[0, 0]]);
  const order = [0];
  const add = (gid: number) => {
    if (gid >= index.numGlyphs || newIndex.has(gid)) return;
    newIndex.set(gid, order.length);
    order.push(gid);
  };
  for (const gid of glyphs) add(gid);
  for (let i = 0; i < order.length; i++) {
    const [s, e] = index.glyphRange(order[i]!);
    for (const off of componentOffsets(view, glyf + s, glyf + e)) add(view.getUint16(glyf + s + off));
  }
  // glyf: each kept glyph copied, component indices rewritten, padded to 4 bytes.
  const pieces: Uint8Array[] = [];
  const locaOut = new DataView(new ArrayBuffer(4 * (order.length + 1)));
  let size = 0;
  order.forEach((gid, i) => {
    const [s, e] = index.glyphRange(gid);
    const glyph = bytes.slice(glyf + s, glyf + e);
    const gv = new DataView(glyph.buffer);
    for (const off of componentOffsets(view, glyf + s, glyf + e)) gv.setUint16(off, newIndex.get(gv.getUint16(off))!);
    locaOut.setUint32(4 * i, size);
    pieces.push(glyph);
    size += glyph.length;
    const pad = (4 - (glyph.length % 4)) % 4;
    if (pad) { pieces.push(new Uint8Array(pad)); size += pad; }
  });
  locaOut.setUint32(4 * order.length, size);
  const glyfOut = concat(pieces);
  // hmtx: one full metric per kept glyph.
  const hmtx = table.get("hmtx")!.offset;
  const hmtxOut = new DataView(new ArrayBuffer(4 * order.length));
  order.forEach((gid, i) => {
    const m = Math.min(gid, index.hMetrics - 1);
    hmtxOut.setUint16(4 * i, view.getUint16(hmtx + 4 * m));
    hmtxOut.setInt16(4 * i + 2, gid < index.hMetrics ? view.getInt16(hmtx + 4 * gid + 2) : view.getInt16(hmtx + 4 * index.hMetrics + 2 * (gid - index.hMetrics)));
  });
  const copy = (tag: string) => {
    const t = table.get(tag)!;
    return bytes.slice(t.offset, t.offset + t.length);
  };
  const head = copy("head");
  new DataView(head.buffer).setUint32(8, 0); // checkSumAdjustment, set below
  new DataView(head.buffer).setInt16(50, 1); // long loca
  const hhea = copy("hhea");
  new DataView(hhea.buffer).setUint16(34, order.length);
  const maxp = copy("maxp");
  new DataView(maxp.buffer).setUint16(4, order.length);
  const out = new Map<string, Uint8Array>([
    ["glyf", glyfOut], ["head", head], ["hhea", hhea], ["hmtx", new Uint8Array(hmtxOut.buffer)],
    ["loca", new Uint8Array(locaOut.buffer)], ["maxp", maxp],
  ]);
  for (const tag of ["cvt ", "fpgm", "prep"]) if (table.has(tag)) out.set(tag, copy(tag));
  return { bytes: writeFont(out), newIndex };
}

/** An sfnt file of `tables` (tags in ascending order as the format asks), checksums set. */
function writeFont(tables: Map<string, Uint8Array>): Uint8Array {
  const tags = [...tables.keys()].sort();
  const n = tags.length;
  const log2 = Math.floor(Math.log2(n));
  const headerSize = 12 + 16 * n;
  let size = headerSize;
  for (const tag of tags) size += (tables.get(tag)!.length + 3) & ~3;
  const file = new Uint8Array(size);
  const view = new DataView(file.buffer);
  view.setUint32(0, 0x00010000);
  view.setUint16(4, n);
  view.setUint16(6, 16 * 2 ** log2);
  view.setUint16(8, log2);
  view.setUint16(10, 16 * n - 16 * 2 ** log2);
  let offset = headerSize, headAt = 0;
  tags.forEach((tag, i) => {
    const data = tables.get(tag)!;
    const rec = 12 + 16 * i;
    for (let k = 0; k < 4; k++) file[rec + k] = tag.charCodeAt(k);
    file.set(data, offset);
    view.setUint32(rec + 4, checksum(file, offset, data.length));
    view.setUint32(rec + 8, offset);
    view.setUint32(rec + 12, data.length);
    if (tag === "head") headAt = offset;
    offset += (data.length + 3) & ~3;
  });
  // head.checkSumAdjustment = 0xB1B0AFBA − checksum of the whole file (OpenType "head").
  view.setUint32(headAt + 8, (0xb1b0afba - checksum(file, 0, file.length)) >>> 0);
  return file;
}

/** Sum of big-endian 32-bit words, the data zero-padded to a multiple of 4 bytes. */
function checksum(file: Uint8Array, offset: number, length: number): number {
  let sum = 0;
  for (let i = 0; i < length; i += 4) {
    sum = (sum + (((file[offset + i]! << 24) | ((file[offset + i + 1] ?? 0) << 16) | ((file[offset + i + 2] ?? 0) << 8) | (file[offset + i + 3] ?? 0)) >>> 0)) >>> 0;
  }
  return sum;
}

function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out;
}
