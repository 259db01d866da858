/**
 * Vector PDF of a figure scene: paths as PDF paths (one per scene path), text as text in
 * Liberation Sans embedded as a TrueType subset (CIDFontType2, Identity-H, with a ToUnicode
 * map so the text can be searched and copied), page size the figure's physical size.
 * Written directly (ISO 32000-1): a scene is a few paths and text lines, and a general PDF
 * library spent ~0.3 s loading and laying out what this writes in ~20 ms (bench/B7).
 */
import { readFileSync } from "node:fs";
import { deflateSync } from "node:zlib";
import type { PathItem, Scene, SceneItem, TextItem } from "../../src/report/render/scene.js";
import { SCRIPT_SCALE, SCRIPT_SHIFT } from "../../src/report/render/markup.js";
import { figureFonts } from "./fonts.js";
import { parseTrueType } from "./trueType.js";

type Font = ReturnType<typeof parseTrueType>;

/** PDF points per CSS px (72 pt and 96 px per inch). */
const PT_PER_PX = 0.75;

const parsed = new Map<string, Font>();

/** The regular and italic faces, each read once per process. */
function faces(): { regular: Font; italic: Font } {
  const files = figureFonts();
  const load = (file: string) => {
    let font = parsed.get(file);
    if (!font) parsed.set(file, (font = parseTrueType(new Uint8Array(readFileSync(file)), file)));
    return font;
  };
  return { regular: load(files.regular), italic: load(files.italic) };
}

/** The bytes of a one-page PDF of `scene` (page = widthMm × heightMm). */
export async function sceneToPdf(scene: Scene): Promise<Uint8Array> {
  const fonts = faces();
  // First the glyphs the text uses, so each face is subset (and renumbered) before drawing.
  // glyph index → the character it draws (for the ToUnicode map), per face.
  const used = { regular: new Map<number, number>(), italic: new Map<number, number>() };
  (function collect(items: SceneItem[]) {
    for (const item of items) {
      if (item.type === "group") collect(item.items);
      else if (item.type === "text") {
        for (const run of item.runs) {
          const key = run.italic ? "italic" : "regular";
          for (const ch of run.text) {
            const c = ch.codePointAt(0)!;
            used[key].set(fonts[key].glyphOf(c), c);
          }
        }
      }
    }
  })(scene.items);
  const pdf = new PdfFile();
  const catalog = pdf.reserve(), pages = pdf.reserve(), page = pdf.reserve();
  const fontRefs: string[] = [];
  const glyphMaps = { regular: new Map<number, number>(), italic: new Map<number, number>() };
  for (const key of ["regular", "italic"] as const) {
    if (!used[key].size) continue;
    const { id, newIndex } = embedFont(pdf, fonts[key], used[key]);
    glyphMaps[key] = newIndex;
    fontRefs.push(`/${key === "regular" ? "R" : "I"} ${id} 0 R`);
  }

  const content = new ContentWriter(fonts, glyphMaps);
  const pageW = (scene.widthMm / 25.4) * 72, pageH = (scene.heightMm / 25.4) * 72;
  // px with the origin top left, y down (as in the SVG) → PDF points, y up; the scene
  // fills the page as the SVG's viewBox fills its mm size.
  const scale = Math.min(pageW / scene.width, pageH / scene.height) || PT_PER_PX;
  const dx = (pageW - scene.width * scale) / 2, dy = (pageH - scene.height * scale) / 2;
  content.op(`${n3(scale)} 0 0 ${n3(-scale)} ${n3(dx)} ${n3(pageH - dy)} cm 4 M`);
  content.op(`${rgb(scene.background)} rg 0 0 ${n(scene.width)} ${n(scene.height)} re f`);
  scene.items.forEach(function draw(item: SceneItem) {
    if (item.type === "group") {
      const c = item.clip;
      content.op(`q ${n(c.x)} ${n(c.y)} ${n(c.width)} ${n(c.height)} re W n`);
      item.items.forEach(draw);
      content.op("Q");
    } else if (item.type === "path") content.path(item);
    else content.text(item);
  });

  const states = [...content.states].map(([name, [fill, stroke]]) => `/${name} << /Type /ExtGState /ca ${n3(fill)} /CA ${n3(stroke)} >>`);
  const contents = pdf.stream(content.toString(), "");
  pdf.set(catalog, `<< /Type /Catalog /Pages ${pages} 0 R >>`);
  pdf.set(pages, `<< /Type /Pages /Kids [${page} 0 R] /Count 1 >>`);
  pdf.set(page, `<< /Type /Page /Parent ${pages} 0 R /MediaBox [0 0 ${n3(pageW)} ${n3(pageH)}] /Contents ${contents} 0 R /Resources << /Font << ${fontRefs.join(" ")} >> /ExtGState << ${states.join(" ")} >> >> >>`);
  const info = pdf.add("<< /Title (fringekit figure) /Producer (fringekit) /Creator (fringekit) >>");
  return pdf.finish(catalog, info);
}

/** The page's content stream: graphics operators in the scene's px coordinates. */
class ContentWriter {
  private out: string[] = [];
  /** Graphics states for opacities: name → [fill, stroke] alpha. */
  readonly states = new Map<string, [number, number]>();

  constructor(
    private readonly fonts: { regular: Font; italic: Font },
    private readonly glyphMaps: { regular: Map<number, number>; italic: Map<number, number> },
  ) {}

  op(text: string): void {
    this.out.push(text);
  }

  path(item: PathItem): void {
    const stroke = item.stroke !== undefined && (item.strokeWidth ?? 1) > 0;
    const fill = item.fill !== undefined;
    if (!stroke && !fill) return;
    // Coordinates, line width and dashes in tenths of a px (see pathOperators).
    const ops = ["q .1 0 0 .1 0 0 cm"];
    const alpha = [fill ? item.fillOpacity ?? 1 : 1, stroke ? item.strokeOpacity ?? 1 : 1] as [number, number];
    if (alpha[0] < 1 || alpha[1] < 1) ops.push(`/${this.state(alpha)} gs`);
    if (fill) ops.push(`${rgb(item.fill!)} rg`);
    if (stroke) {
      ops.push(`${rgb(item.stroke!)} RG ${n3(10 * (item.strokeWidth ?? 1))} w`);
      if (item.cap === "round") ops.push("1 J");
      if (item.join === "round") ops.push("1 j");
      if (item.dash?.length) ops.push(`[${item.dash.map((v) => n3(10 * v)).join(" ")}] 0 d`);
    }
    this.out.push(ops.join(" "), pathOperators(item.d), `${fill && stroke ? "B" : fill ? "f" : "S"} Q`);
  }

  text(t: TextItem): void {
    const pieces = t.runs.map((run) => {
      const key = run.italic ? "italic" : "regular";
      const font = this.fonts[key];
      const size = run.shift ? t.size * SCRIPT_SCALE : t.size;
      let hex = "", width = 0;
      for (const ch of run.text) {
        const gid = font.glyphOf(ch.codePointAt(0)!);
        width += (font.advance(gid) / font.unitsPerEm) * size;
        hex += hex4(this.glyphMaps[key].get(gid)!);
      }
      return { key, run, size, hex, width };
    });
    const total = pieces.reduce((s, p) => s + p.width, 0);
    const ops = [`q ${rgb(t.color)} rg`];
    // SVG's rotate(a, x, y): clockwise on screen, i.e. [cos sin −sin cos] in y-down coordinates.
    const a = ((t.rotate ?? 0) * Math.PI) / 180;
    const c = Math.cos(a), s = Math.sin(a);
    ops.push(`${n3(c)} ${n3(s)} ${n3(-s)} ${n3(c)} ${n3(t.x)} ${n3(t.y)} cm BT`);
    let x = t.anchor === "middle" ? -total / 2 : t.anchor === "end" ? -total : 0;
    for (const { key, run, size, hex, width } of pieces) {
      const y = run.shift ? SCRIPT_SHIFT[run.shift] * t.size : 0;
      // The text matrix flips y back so glyphs stand upright in the y-down page space.
      if (hex) ops.push(`/${key === "regular" ? "R" : "I"} ${n3(size)} Tf 1 0 0 -1 ${n3(x)} ${n3(y)} Tm <${hex}> Tj`);
      x += width;
    }
    ops.push("ET Q");
    this.out.push(ops.join(" "));
  }

  private state(alpha: [number, number]): string {
    for (const [name, a] of this.states) if (a[0] === alpha[0] && a[1] === alpha[1]) return name;
    const name = `G${this.states.size}`;
    this.states.set(name, alpha);
    return name;
  }

  toString(): string {
    return this.out.join("\n");
  }
}

/**
 * PDF path operators for an SVG path of the scene's kind (M, L, H, V, Z, absolute or
 * relative; what PathBuilder writes), coordinates in tenths of a px as integers (the content
 * stream scales by 0.1 around paths; scene coordinates carry 0.1 px). A zero-length segment
 * stays one: with round caps it paints a dot (ISO 32000-1 §8.5.3.2), the markers' drawing.
 */
export function pathOperators(d: string): string {
  let out = "";
  let cmd = 0, x = 0, y = 0, sx = 0, sy = 0;
  let i = 0;
  const len = d.length;
  // Read by hand into integer tenths: the paths of a 4096-point figure hold ~50 000 numbers,
  // and this runs once per process, mostly before the JIT has compiled it.
  const number = (): number => {
    let k = d.charCodeAt(i);
    while (k === 32 || k === 44 || k === 10) k = d.charCodeAt(++i);
    const start = i;
    let sign = 1;
    if (k === 45 || k === 43) {
      if (k === 45) sign = -1;
      k = d.charCodeAt(++i);
    }
    let whole = 0, digits = 0;
    while (k >= 48 && k <= 57) {
      whole = whole * 10 + (k - 48);
      digits++;
      k = d.charCodeAt(++i);
    }
    let tenths = whole * 10;
    if (k === 46) {
      k = d.charCodeAt(++i);
      let place = 0;
      while (k >= 48 && k <= 57) {
        if (place === 0) tenths += k - 48;
        else if (place === 1 && k >= 53) tenths += 1; // round half up at the hundredths
        place++;
        digits++;
        k = d.charCodeAt(++i);
      }
    }
    if (k === 101 || k === 69) {
      const end = skipExponent(d, i);
      const value = Math.round(Number(d.slice(start, end)) * 10);
      i = end;
      return value;
    }
    return digits ? sign * tenths : NaN;
  };
  while (i < len) {
    const c = d.charCodeAt(i);
    if (c === 32 || c === 44 || c === 10) { i++; continue; }
    if ((c >= 65 && c <= 90) || (c >= 97 && c <= 122)) {
      cmd = c;
      i++;
      if (c === 90 || c === 122) { // Z z
        out += "h\n";
        x = sx; y = sy;
      }
      continue;
    }
    const rel = cmd >= 97;
    if (cmd === 77 || cmd === 109 || cmd === 76 || cmd === 108) { // M m L l
      const a = number(), b = number();
      if (Number.isNaN(a) || Number.isNaN(b)) break; // malformed: stop, as an SVG renderer does
      x = (rel ? x : 0) + a; y = (rel ? y : 0) + b;
      if (cmd === 77 || cmd === 109) {
        out += `${x} ${y} m\n`;
        sx = x; sy = y;
        cmd = cmd === 77 ? 76 : 108; // further pairs are line-tos
      } else out += `${x} ${y} l\n`;
    } else if (cmd === 72 || cmd === 104 || cmd === 86 || cmd === 118) { // H h V v
      const a = number();
      if (Number.isNaN(a)) break;
      if (cmd === 72 || cmd === 104) x = (rel ? x : 0) + a;
      else y = (rel ? y : 0) + a;
      out += `${x} ${y} l\n`;
    } else break; // a command the scene never writes (curves): stop there
  }
  return out;
}

/** Index just past the exponent that starts at `i` ("e-3"). */
function skipExponent(d: string, i: number): number {
  i++;
  if (d[i] === "-" || d[i] === "+") i++;
  while (i < d.length && d.charCodeAt(i) >= 48 && d.charCodeAt(i) <= 57) i++;
  return i;
}

/** Embed `font` (its glyphs `used`) as a Type 0 font; returns the object number and the glyphs' indices in the subset. */
function embedFont(pdf: PdfFile, font: Font, used: Map<number, number>): { id: number; newIndex: Map<number, number> } {
  const glyphs = [...used.keys()].sort((a, b) => a - b);
  const { bytes, newIndex } = font.subset(glyphs);
  // A subset's name starts with six capital letters and "+" (ISO 32000-1 §9.6.4), here from the glyph set.
  let hash = 2166136261;
  for (const g of glyphs) hash = Math.imul(hash ^ g, 16777619) >>> 0;
  let tag = "";
  for (let k = 0; k < 6; k++, hash = Math.floor(hash / 26)) tag += String.fromCharCode(65 + (hash % 26));
  const name = `${tag}+${font.postScriptName}`;
  const em = (v: number) => Math.round((v * 1000) / font.unitsPerEm);
  const file = pdf.stream(bytes, `/Length1 ${bytes.length}`);
  const flags = 32 | (font.italicAngle !== 0 ? 64 : 0); // nonsymbolic, italic
  const descriptor = pdf.add(
    `<< /Type /FontDescriptor /FontName /${name} /Flags ${flags} /FontBBox [${font.bbox.map(em).join(" ")}] /ItalicAngle ${n3(font.italicAngle)} ` +
      `/Ascent ${em(font.ascent)} /Descent ${em(font.descent)} /CapHeight ${em(font.capHeight)} /StemV 80 /FontFile2 ${file} 0 R >>`,
  );
  const widths = glyphs.map((g) => `${newIndex.get(g)} [${em(font.advance(g))}]`).join(" ");
  const cid = pdf.add(
    `<< /Type /Font /Subtype /CIDFontType2 /BaseFont /${name} /CIDSystemInfo << /Registry (Adobe) /Ordering (Identity) /Supplement 0 >> ` +
      `/FontDescriptor ${descriptor} 0 R /DW 1000 /W [${widths}] /CIDToGIDMap /Identity >>`,
  );
  const toUnicode = pdf.stream(toUnicodeMap(used, newIndex), "");
  const id = pdf.add(`<< /Type /Font /Subtype /Type0 /BaseFont /${name} /Encoding /Identity-H /DescendantFonts [${cid} 0 R] /ToUnicode ${toUnicode} 0 R >>`);
  return { id, newIndex };
}

/** The CMap from the subset's glyph indices to the characters they draw (ISO 32000-1 §9.10.3). */
function toUnicodeMap(chars: Map<number, number>, newIndex: Map<number, number>): string {
  const entries = [...chars].filter(([g]) => g !== 0).map(([g, c]) => `<${hex4(newIndex.get(g)!)}> <${utf16(c)}>`);
  const blocks: string[] = [];
  for (let i = 0; i < entries.length; i += 100) {
    const part = entries.slice(i, i + 100);
    blocks.push(`${part.length} beginbfchar\n${part.join("\n")}\nendbfchar`);
  }
  return [
    "/CIDInit /ProcSet findresource begin", "12 dict begin", "begincmap",
    "/CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def",
    "/CMapName /Adobe-Identity-UCS def", "/CMapType 2 def",
    "1 begincodespacerange", "<0000> <ffff>", "endcodespacerange",
    ...blocks,
    "endcmap", "CMapName currentdict /CMap defineresource pop", "end", "end",
  ].join("\n");
}

/** Objects of one PDF file, numbered from 1, written with a cross-reference table. */
class PdfFile {
  private objects: (Uint8Array | undefined)[] = [];

  reserve(): number {
    this.objects.push(undefined);
    return this.objects.length;
  }

  set(id: number, dict: string): void {
    this.objects[id - 1] = latin1(`${id} 0 obj\n${dict}\nendobj\n`);
  }

  add(dict: string): number {
    const id = this.reserve();
    this.set(id, dict);
    return id;
  }

  /** A Flate-compressed stream object; `extra` goes into its dictionary. */
  stream(data: string | Uint8Array, extra: string): number {
    // Level 3: a quarter of the default level's time for a 4096-point figure's content (4 against 13 ms), ~20 % larger.
    const packed = deflateSync(typeof data === "string" ? latin1(data) : data, { level: 3 });
    const id = this.reserve();
    const head = latin1(`${id} 0 obj\n<< /Length ${packed.length} /Filter /FlateDecode${extra ? ` ${extra}` : ""} >>\nstream\n`);
    this.objects[id - 1] = concatBytes([head, packed, latin1("\nendstream\nendobj\n")]);
    return id;
  }

  finish(root: number, info: number): Uint8Array {
    // The binary comment marks the file as binary for transfer programs (ISO 32000-1 §7.5.2).
    const parts: Uint8Array[] = [latin1("%PDF-1.4\n%\u00e2\u00e3\u00cf\u00d3\n")];
    let offset = parts[0]!.length;
    const xref = ["xref", `0 ${this.objects.length + 1}`, "0000000000 65535 f "];
    for (const obj of this.objects) {
      if (!obj) throw new Error("PDF object reserved but never written");
      xref.push(`${String(offset).padStart(10, "0")} 00000 n `);
      parts.push(obj);
      offset += obj.length;
    }
    parts.push(latin1(`${xref.join("\n")}\ntrailer\n<< /Size ${this.objects.length + 1} /Root ${root} 0 R /Info ${info} 0 R >>\nstartxref\n${offset}\n%%EOF\n`));
    return concatBytes(parts);
  }
}

function latin1(text: string): Uint8Array {
  return Buffer.from(text, "latin1");
}

function concatBytes(parts: Uint8Array[]): Uint8Array {
  return new Uint8Array(Buffer.concat(parts));
}

/** A number as PDF writes it: no exponent, at most 2 decimals (px coordinates; scene paths carry 0.1 px). */
function n(v: number): string {
  return String(Math.round(v * 100) / 100 + 0);
}

/** A number with at most 4 decimals (matrix entries, sizes, opacities). */
function n3(v: number): string {
  const t = String(Math.round(v * 10000) / 10000 + 0);
  return t.includes("e") ? "0" : t;
}

/** A code point as UTF-16BE hex (a surrogate pair above the BMP). */
function utf16(c: number): string {
  if (c < 0x10000) return hex4(c);
  const v = c - 0x10000;
  return hex4(0xd800 + (v >> 10)) + hex4(0xdc00 + (v & 0x3ff));
}

function hex4(v: number): string {
  return v.toString(16).padStart(4, "0");
}

/** "#rrggbb" as PDF colour components 0–1. */
function rgb(hex: string): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) return "0 0 0";
  return [m[1], m[2], m[3]].map((h) => n3(parseInt(h!, 16) / 255)).join(" ");
}
