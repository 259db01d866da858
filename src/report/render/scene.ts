/**
 * A drawn figure as a few primitive items (paths, text, clipped groups) in CSS px with the
 * origin at the top left: what figureScene makes from a FigureSpec and what the SVG writer
 * (src/report/render/svg.ts) and the PDF writer (kernel-ext/figures) turn into files.
 */
import type { TextRun } from "./markup.js";

/** A path in SVG path syntax (absolute and relative M, L, H, V, Z), stroked and/or filled. */
export interface PathItem {
  type: "path";
  d: string;
  /** Fill colour "#rrggbb" (none when absent) and its opacity. */
  fill?: string;
  fillOpacity?: number;
  /** Stroke colour "#rrggbb" (none when absent), its opacity and width (px). */
  stroke?: string;
  strokeOpacity?: number;
  strokeWidth?: number;
  /** Dash pattern (px), solid when absent. */
  dash?: number[];
  /** Line ends: round ones also make the dots of circle markers (zero-length segments). */
  cap?: "butt" | "round";
  join?: "miter" | "round";
  /** Box (px) of the path's points before stroking, when the builder knew it (the PNG writer uses it). */
  bounds?: Bounds;
}

/** An axis-aligned box (px): x0 ≤ x1, y0 ≤ y1. */
export interface Bounds {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** One line of styled text with its anchor point (x, baseline y), optionally rotated about it (degrees, clockwise). */
export interface TextItem {
  type: "text";
  x: number;
  y: number;
  runs: TextRun[];
  /** Font size (px). */
  size: number;
  color: string;
  anchor: "start" | "middle" | "end";
  rotate?: number;
}

/** Items drawn inside a clip rectangle (px). */
export interface GroupItem {
  type: "group";
  clip: { x: number; y: number; width: number; height: number };
  items: SceneItem[];
}

export type SceneItem = PathItem | TextItem | GroupItem;

/** A whole figure: size in CSS px and mm, background, items in drawing order. */
export interface Scene {
  width: number;
  height: number;
  widthMm: number;
  heightMm: number;
  background: string;
  fontFamily: string;
  items: SceneItem[];
}

/** Round a coordinate (px) to 0.1 px: 0.03 mm, below the dot pitch of a 600 dpi print. */
export function r1(v: number): number {
  return Math.round(v * 10) / 10;
}

/** Shortest text of a number rounded to 0.1 ("0.5" → ".5", "-0.5" → "-.5"). */
export function num(v: number): string {
  const t = String(r1(v) + 0);
  return t.startsWith("0.") ? t.slice(1) : t.startsWith("-0.") ? `-${t.slice(2)}` : t;
}

/**
 * Text of a whole number of tenths as num() writes it (123 → "12.3", 5 → ".5", -5 → "-.5",
 * 40 → "4"): integer arithmetic, a 4096-point figure writes some 50 000 of these.
 */
function tenths(t: number): string {
  if (t === 0) return "0";
  const a = t < 0 ? -t : t;
  const whole = Math.floor(a / 10), frac = a - whole * 10;
  const text = frac === 0 ? String(whole) : whole === 0 ? `.${frac}` : `${whole}.${frac}`;
  return t < 0 ? `-${text}` : text;
}

/**
 * Compact path builder: coordinates rounded to 0.1 px and written relative to the previous
 * point, so a 4096-point curve stays a few tens of kilobytes.
 */
export class PathBuilder {
  private parts: string[] = [];
  // Current point and subpath start in whole tenths of a px, so differences are exact.
  private cx = 0;
  private cy = 0;
  private sx = 0;
  private sy = 0;
  // Box of every point written, in tenths.
  private minX = Infinity;
  private minY = Infinity;
  private maxX = -Infinity;
  private maxY = -Infinity;

  private extend(tx: number, ty: number): void {
    if (tx < this.minX) this.minX = tx;
    if (tx > this.maxX) this.maxX = tx;
    if (ty < this.minY) this.minY = ty;
    if (ty > this.maxY) this.maxY = ty;
  }

  /** Start a subpath at (x, y) px. */
  move(x: number, y: number): this {
    const tx = Math.round(x * 10), ty = Math.round(y * 10);
    if (this.parts.length === 0) this.parts.push(`M${tenths(tx)} ${tenths(ty)}`);
    else {
      const dy = ty - this.cy;
      this.parts.push(`m${tenths(tx - this.cx)}${dy < 0 ? "" : " "}${tenths(dy)}`);
    }
    this.cx = tx; this.cy = ty;
    this.sx = tx; this.sy = ty;
    this.extend(tx, ty);
    return this;
  }

  /** Line to (x, y) px. */
  line(x: number, y: number): this {
    const tx = Math.round(x * 10), ty = Math.round(y * 10);
    const dx = tx - this.cx, dy = ty - this.cy;
    if (dy === 0) this.parts.push(`h${tenths(dx)}`);
    else if (dx === 0) this.parts.push(`v${tenths(dy)}`);
    else this.parts.push(`l${tenths(dx)}${dy < 0 ? "" : " "}${tenths(dy)}`);
    this.cx = tx; this.cy = ty;
    this.extend(tx, ty);
    return this;
  }

  /** A dot at (x, y): a zero-length segment, drawn as a disc by a round-capped stroke. */
  dot(x: number, y: number): this {
    this.move(x, y);
    this.parts.push("h0");
    return this;
  }

  /** Close the current subpath. */
  close(): this {
    this.parts.push("z");
    this.cx = this.sx; this.cy = this.sy;
    return this;
  }

  /** Box (px) of the points written so far (as rounded in the path), or undefined for an empty path. */
  bounds(): Bounds | undefined {
    if (this.minX > this.maxX) return undefined;
    return { x0: this.minX / 10, y0: this.minY / 10, x1: this.maxX / 10, y1: this.maxY / 10 };
  }

  get empty(): boolean {
    return this.parts.length === 0;
  }

  toString(): string {
    return this.parts.join("");
  }
}
