/**
 * Draws a FigureSpec (the plotly-shaped description the figure builders return) as a Scene,
 * without plotly and without a DOM, so the kernel, the command line and the widgets' export
 * buttons make the same file. Covers what the builders use: scatter traces (lines, markers
 * "circle" and "x-thin-open", error bars, "tonexty" bands), heat maps with a colour bar,
 * linear and category axes (domains, shared "matches" ranges, "scaleanchor", auto, array and
 * nticks ticks, rotated tick labels, titles, mirrored frames), line shapes, text annotations
 * and legends (one row above the plot or a vertical box in a corner). Layout follows plotly's
 * rules closely enough that the same description looks the same in a widget and on paper.
 */
import type { FigureSpec } from "../figures/figureSpec.js";
import { parseColor, scaleColor } from "./color.js";
import { parseMarkup, runsWidth, type TextRun } from "./markup.js";
import { PathBuilder, type GroupItem, type PathItem, type Scene, type SceneItem, type TextItem } from "./scene.js";
import { autoTicks, tickLabel } from "./ticks.js";

// Figure descriptions are plain JSON; read them loosely and check each field's type where used.
type Loose = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

interface Axis {
  id: string;
  letter: "x" | "y";
  spec: Loose;
  domain: [number, number];
  anchor: string;
  categories?: string[];
  low: number;
  high: number;
  /** Largest marker radius (px) on this axis: autorange leaves that much room. */
  padPx: number;
  tozero: boolean;
  hasData: boolean;
  range: [number, number];
  /** Pixel of range[0] and of range[1]. */
  p0: number;
  p1: number;
  /** Pixel of the axis line (x axes: a y pixel; y axes: an x pixel). */
  position: number;
  ticks: { value: number; label: TextRun[] }[];
  tickPx: number;
}

const DEFAULT_FONT = "'Liberation Sans', Arial, Helvetica, sans-serif";

/**
 * The scene of `figure`: CSS px (layout.width × layout.height), physical size from layout.meta.
 * @param figure a figure description from src/report/figures
 */
export function figureScene(figure: Pick<FigureSpec, "data" | "layout">): Scene {
  const layout = figure.layout as Loose;
  const data = (figure.data ?? []) as Loose[];
  const W = Number(layout.width) || 700;
  const H = Number(layout.height) || 450;
  const font = (layout.font ?? {}) as Loose;
  const fontPx = Number(font.size) || 12;
  const ink = parseColor(font.color ?? "#444444").hex;
  const axes = collectAxes(layout, data);
  const margin = { l: 80, r: 80, t: 100, b: 80, ...(layout.margin ?? {}) } as Loose;
  const legend = legendItems(layout, data, fontPx);
  const colorbar = data.find((t) => t.type === "heatmap" && t.showscale !== false && t.colorbar) as Loose | undefined;

  // Two passes: tick labels depend on axis lengths, which depend on the margins they need.
  let box = { L: margin.l, R: margin.r, T: margin.t, B: margin.b };
  for (let pass = 0; pass < 3; pass++) {
    placeAxes(axes, box, W, H);
    box = neededMargins(axes, margin, legend, colorbar, W, H, fontPx);
  }
  placeAxes(axes, box, W, H);
  const plot = { x: box.L, y: box.T, width: W - box.L - box.R, height: H - box.T - box.B };

  const items: SceneItem[] = [];
  const bg = parseColor(layout.plot_bgcolor ?? "#ffffff");
  // Traces, grouped by subplot and clipped to it.
  let group: GroupItem | null = null;
  let groupKey = "";
  const previous = new Map<string, Loose>();
  for (const trace of data) {
    if (trace.visible === false) continue;
    const xa = axes.get(axisId(trace.xaxis, "x"))!, ya = axes.get(axisId(trace.yaxis, "y"))!;
    const key = `${xa.id}${ya.id}`;
    if (!group || key !== groupKey) {
      const x0 = Math.min(xa.p0, xa.p1), y0 = Math.min(ya.p0, ya.p1);
      group = { type: "group", clip: { x: x0, y: y0, width: Math.abs(xa.p1 - xa.p0), height: Math.abs(ya.p1 - ya.p0) }, items: [] };
      if (bg.alpha > 0 && bg.hex !== "#ffffff") {
        const c = group.clip;
        group.items.push({ type: "path", d: rectPath(x0, y0, c.width, c.height), fill: bg.hex, bounds: { x0: c.x, y0: c.y, x1: c.x + c.width, y1: c.y + c.height } });
      }
      items.push(group);
      groupKey = key;
    }
    if (trace.type === "heatmap") group.items.push(...heatmapItems(trace, xa, ya));
    else group.items.push(...scatterItems(trace, xa, ya, previous.get(key)));
    previous.set(key, trace);
  }
  for (const axis of axes.values()) items.push(...axisItems(axis, axes, fontPx, ink));
  items.push(...shapeItems(layout, axes, plot));
  items.push(...annotationItems(layout, axes, plot, fontPx, ink));
  if (legend.items.length) items.push(...legendDrawing(legend, layout, plot, fontPx, ink));
  if (colorbar) items.push(...colorbarItems(colorbar, plot, fontPx, ink));

  const meta = (layout.meta ?? {}) as Loose;
  return {
    width: W,
    height: H,
    widthMm: Number(meta.widthMm) || Math.round((W / 96) * 25.4 * 10) / 10,
    heightMm: Number(meta.heightMm) || Math.round((H / 96) * 25.4 * 10) / 10,
    background: parseColor(layout.paper_bgcolor ?? "#ffffff").hex,
    fontFamily: typeof font.family === "string" && font.family ? `'Liberation Sans', ${font.family}` : DEFAULT_FONT,
    items,
  };
}

/* ----------------------------------------------------------------- axes */

function axisId(ref: unknown, letter: "x" | "y"): string {
  return typeof ref === "string" && new RegExp(`^${letter}\\d*$`).test(ref) ? ref : letter;
}

function layoutKey(id: string): string {
  return `${id[0]}axis${id.slice(1)}`;
}

function isNum(v: unknown): v is number {
  return typeof v === "number" && Number.isFinite(v);
}

function collectAxes(layout: Loose, data: Loose[]): Map<string, Axis> {
  const axes = new Map<string, Axis>();
  const make = (id: string): Axis => {
    const spec = (layout[layoutKey(id)] ?? {}) as Loose;
    const letter = id[0] as "x" | "y";
    const domain = Array.isArray(spec.domain) && spec.domain.length === 2 ? [Number(spec.domain[0]), Number(spec.domain[1])] as [number, number] : [0, 1] as [number, number];
    const axis: Axis = {
      id, letter, spec, domain, anchor: typeof spec.anchor === "string" ? spec.anchor : letter === "x" ? "y" : "x",
      low: Infinity, high: -Infinity, padPx: 0, tozero: spec.rangemode === "tozero", hasData: false,
      range: [0, 1], p0: 0, p1: 1, position: 0, ticks: [], tickPx: Number(spec.tickfont?.size) || Number(layout.font?.size) || 12,
    };
    axes.set(id, axis);
    return axis;
  };
  for (const key of Object.keys(layout)) {
    const m = /^([xy])axis(\d*)$/.exec(key);
    if (m && m[2] !== "1") make(`${m[1]}${m[2]}`);
  }
  const get = (id: string) => axes.get(id) ?? make(id);
  for (const trace of data) {
    if (trace.visible === false) continue;
    const xa = get(axisId(trace.xaxis, "x")), ya = get(axisId(trace.yaxis, "y"));
    if (trace.type === "heatmap") {
      for (const [axis, labels, count] of [[xa, trace.x, (trace.z?.[0] ?? []).length], [ya, trace.y, (trace.z ?? []).length]] as const) {
        axis.categories = Array.isArray(labels) ? labels.map(String) : Array.from({ length: count as number }, (_, i) => String(i));
        axis.hasData = true;
      }
      continue;
    }
    const xs = (trace.x ?? []) as unknown[], ys = (trace.y ?? []) as unknown[];
    const errors = trace.error_y?.visible !== false ? (trace.error_y?.array as unknown[] | undefined) : undefined;
    const mode = String(trace.mode ?? "lines+markers");
    const radius = mode.includes("markers") ? (Number(trace.marker?.size) || 6) / 2 + 1 : 0;
    for (let i = 0; i < Math.min(xs.length, ys.length); i++) {
      const x = xs[i], y = ys[i];
      if (!isNum(x) || !isNum(y)) continue;
      xa.low = Math.min(xa.low, x); xa.high = Math.max(xa.high, x);
      const e = errors?.[i];
      const spread = isNum(e) ? Math.abs(e) : 0;
      ya.low = Math.min(ya.low, y - spread); ya.high = Math.max(ya.high, y + spread);
    }
    xa.hasData = ya.hasData = true;
    xa.padPx = Math.max(xa.padPx, radius);
    ya.padPx = Math.max(ya.padPx, radius);
  }
  // Shared ranges: an axis that "matches" another takes the union of both.
  for (const axis of axes.values()) {
    const other = typeof axis.spec.matches === "string" ? axes.get(axis.spec.matches) : undefined;
    if (!other) continue;
    const low = Math.min(axis.low, other.low), high = Math.max(axis.high, other.high);
    axis.low = other.low = low; axis.high = other.high = high;
    axis.padPx = other.padPx = Math.max(axis.padPx, other.padPx);
    axis.hasData = other.hasData = axis.hasData || other.hasData;
  }
  return axes;
}

/** Data range of an axis before padding (plotly's autorange with rangemode). */
function axisRange(axis: Axis, lengthPx: number): [number, number] {
  const explicit = axis.spec.range;
  if (Array.isArray(explicit) && isNum(explicit[0]) && isNum(explicit[1])) return [explicit[0], explicit[1]];
  if (axis.categories) return [-0.5, axis.categories.length - 0.5];
  let low = axis.hasData && Number.isFinite(axis.low) ? axis.low : 0;
  let high = axis.hasData && Number.isFinite(axis.high) ? axis.high : 1;
  if (axis.tozero) { low = Math.min(low, 0); high = Math.max(high, 0); }
  if (high <= low) { low -= 1; high += 1; }
  const pad = lengthPx > 20 ? (axis.padPx / lengthPx) * (high - low) : 0;
  return [axis.tozero && low === 0 ? 0 : low - pad, axis.tozero && high === 0 ? 0 : high + pad];
}

/** Set every axis' pixel span, range and ticks for a plot area inside margins `box`. */
function placeAxes(axes: Map<string, Axis>, box: { L: number; R: number; T: number; B: number }, W: number, H: number): void {
  const pw = Math.max(10, W - box.L - box.R), ph = Math.max(10, H - box.T - box.B);
  for (const a of axes.values()) {
    if (a.letter === "x") { a.p0 = box.L + a.domain[0] * pw; a.p1 = box.L + a.domain[1] * pw; }
    else { a.p0 = box.T + (1 - a.domain[0]) * ph; a.p1 = box.T + (1 - a.domain[1]) * ph; }
    a.range = axisRange(a, Math.abs(a.p1 - a.p0));
  }
  // scaleanchor: equal px per unit on both axes, by shortening the longer one (left and top kept).
  for (const a of axes.values()) {
    const other = typeof a.spec.scaleanchor === "string" ? axes.get(a.spec.scaleanchor) : undefined;
    if (!other) continue;
    const perA = Math.abs(a.p1 - a.p0) / Math.abs(a.range[1] - a.range[0]);
    const perB = Math.abs(other.p1 - other.p0) / Math.abs(other.range[1] - other.range[0]);
    const per = Math.min(perA, perB);
    for (const axis of [a, other]) {
      const len = per * Math.abs(axis.range[1] - axis.range[0]);
      // x keeps its left end; y is centred in its span (the free height splits above and below)
      if (axis.letter === "x") axis.p1 = axis.p0 + len;
      else { const spare = axis.p0 - axis.p1 - len; axis.p1 += spare / 2; axis.p0 = axis.p1 + len; }
    }
  }
  for (const a of axes.values()) {
    if (a.spec.autorange === "reversed") [a.p0, a.p1] = [a.p1, a.p0];
    a.ticks = axisTicks(a);
  }
  for (const a of axes.values()) {
    const anchor = axes.get(a.anchor);
    if (a.letter === "x") a.position = anchor ? Math.max(anchor.p0, anchor.p1) : box.T + ph;
    else a.position = anchor ? Math.min(anchor.p0, anchor.p1) : box.L;
  }
}

function axisTicks(a: Axis): Axis["ticks"] {
  if (a.spec.showticklabels === false && a.spec.ticks === "") return [];
  const [low, high] = a.range[0] < a.range[1] ? a.range : [a.range[1], a.range[0]];
  const inside = (v: number) => v >= low - 1e-9 * (high - low) && v <= high + 1e-9 * (high - low);
  if (a.categories) return a.categories.map((c, i) => ({ value: i, label: parseMarkup(c) }));
  if (a.spec.tickmode === "array" && Array.isArray(a.spec.tickvals)) {
    const labels = Array.isArray(a.spec.ticktext) ? a.spec.ticktext : undefined;
    return (a.spec.tickvals as unknown[]).map((v, i) => ({ v, i })).filter(({ v }) => isNum(v) && inside(v))
      .map(({ v, i }) => ({ value: v as number, label: parseMarkup(labels ? String(labels[i]) : tickLabel(v as number)) }));
  }
  const length = Math.abs(a.p1 - a.p0);
  const target = isNum(a.spec.nticks) && a.spec.nticks > 0 ? a.spec.nticks : Math.min(9, Math.max(4, length / (a.letter === "x" ? 80 : 40))) + 1;
  const { values, step } = autoTicks(low, high, target);
  return values.map((v) => ({ value: v, label: parseMarkup(tickLabel(v, step)) }));
}

function toPx(a: Axis, v: number): number {
  return a.p0 + ((v - a.range[0]) / (a.range[1] - a.range[0])) * (a.p1 - a.p0);
}

function ticksOut(a: Axis): number {
  return a.spec.ticks === "outside" ? Number(a.spec.ticklen ?? 5) : 0;
}

function labelsShown(a: Axis): boolean {
  return a.spec.showticklabels !== false && a.ticks.length > 0;
}

function titleText(a: Axis): TextRun[] {
  const t = a.spec.title;
  const text = typeof t === "string" ? t : typeof t?.text === "string" ? t.text : "";
  return parseMarkup(text);
}

function titlePx(a: Axis, fontPx: number): number {
  return Number(a.spec.title?.font?.size) || fontPx;
}

function maxLabelWidth(a: Axis): number {
  return Math.max(0, ...a.ticks.map((t) => runsWidth(t.label, a.tickPx)));
}

/** Space below an x axis line (ticks, labels, title), px. */
function belowX(a: Axis, fontPx: number): { labels: number; total: number } {
  const angle = Math.abs(Number(a.spec.tickangle) || 0) * (Math.PI / 180);
  const labels = labelsShown(a) ? 3 + (angle ? maxLabelWidth(a) * Math.sin(angle) + a.tickPx * Math.cos(angle) * 0.9 : a.tickPx * 1.0) : 0;
  const title = titleText(a).length ? Number(a.spec.title?.standoff ?? 4) + titlePx(a, fontPx) * 1.15 : 0;
  return { labels, total: ticksOut(a) + labels + title };
}

/** Space left of a y axis line, px. */
function leftOfY(a: Axis, fontPx: number): { labels: number; total: number } {
  const labels = labelsShown(a) ? 3 + maxLabelWidth(a) : 0;
  const title = titleText(a).length ? Number(a.spec.title?.standoff ?? 4) + titlePx(a, fontPx) * 1.15 : 0;
  return { labels, total: ticksOut(a) + labels + title };
}

function neededMargins(axes: Map<string, Axis>, margin: Loose, legend: Legend, colorbar: Loose | undefined, W: number, H: number, fontPx: number) {
  let L = Number(margin.l), R = Number(margin.r), T = Number(margin.t), B = Number(margin.b);
  let needL = 0, needB = 0, needR = 0, needT = 0;
  for (const a of axes.values()) {
    const anchor = axes.get(a.anchor);
    if (a.letter === "y" && (!anchor || anchor.domain[0] <= 1e-9)) needL = Math.max(needL, leftOfY(a, fontPx).total);
    if (a.letter === "x" && (!anchor || anchor.domain[0] <= 1e-9)) needB = Math.max(needB, belowX(a, fontPx).total);
    if (a.letter === "y" && labelsShown(a)) needT = Math.max(needT, a.tickPx * 0.6);
    if (a.letter === "x" && labelsShown(a) && !a.spec.tickangle && a.domain[1] >= 1 - 1e-9) {
      // Half the last tick label may stick out right of the plot (and the first, left).
      const last = a.ticks[a.ticks.length - 1]!;
      const first = a.ticks[0]!;
      needR = Math.max(needR, runsWidth(last.label, a.tickPx) / 2 - (Math.max(a.p0, a.p1) - toPx(a, last.value)));
      needL = Math.max(needL, runsWidth(first.label, a.tickPx) / 2 - (toPx(a, first.value) - Math.min(a.p0, a.p1)));
    }
  }
  if (colorbar) needR = Math.max(needR, colorbarWidth(colorbar, W - L - R, fontPx));
  L = Math.max(L, needL + 2); B = Math.max(B, needB + 2); R = Number(margin.r) + Math.max(0, needR);
  // The legend wraps at the final plot width (computed just above), as legendDrawing does.
  if (legend.items.length && legend.above) needT = Math.max(needT, legendHeight(legend, W - L - R, fontPx) + 2);
  T = Number(margin.t) + needT;
  void H;
  return { L, R, T, B };
}

function axisItems(a: Axis, axes: Map<string, Axis>, fontPx: number, ink: string): SceneItem[] {
  const s = a.spec;
  const out: SceneItem[] = [];
  const lo = Math.min(a.p0, a.p1), hi = Math.max(a.p0, a.p1);
  const anchor = axes.get(a.anchor);
  const lineColor = parseColor(s.linecolor ?? "#444444");
  const lineWidth = Number(s.linewidth ?? 1);
  if (s.showline && lineWidth > 0) {
    const p = new PathBuilder();
    const positions = [a.position];
    if (s.mirror && anchor) positions.push(a.letter === "x" ? Math.min(anchor.p0, anchor.p1) : Math.max(anchor.p0, anchor.p1));
    const half = lineWidth / 2; // lines meet at the corners
    for (const pos of positions) {
      if (a.letter === "x") p.move(lo - half, pos).line(hi + half, pos);
      else p.move(pos, lo - half).line(pos, hi + half);
    }
    out.push({ type: "path", d: p.toString(), stroke: lineColor.hex, strokeOpacity: lineColor.alpha, strokeWidth: lineWidth });
  }
  const len = ticksOut(a);
  if (len > 0 && a.ticks.length) {
    const p = new PathBuilder();
    for (const t of a.ticks) {
      const v = toPx(a, t.value);
      if (a.letter === "x") p.move(v, a.position).line(v, a.position + len);
      else p.move(a.position, v).line(a.position - len, v);
    }
    const c = parseColor(s.tickcolor ?? "#444444");
    out.push({ type: "path", d: p.toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: Number(s.tickwidth ?? 1) });
  }
  if (labelsShown(a)) {
    const angle = Number(s.tickangle) || 0;
    for (const t of a.ticks) {
      const v = toPx(a, t.value);
      if (a.letter === "x") {
        if (angle) out.push({ type: "text", x: v + a.tickPx * 0.25, y: a.position + len + 3 + a.tickPx * 0.45, runs: t.label, size: a.tickPx, color: ink, anchor: "end", rotate: angle });
        else out.push({ type: "text", x: v, y: a.position + len + 3 + a.tickPx * 0.78, runs: t.label, size: a.tickPx, color: ink, anchor: "middle" });
      } else {
        out.push({ type: "text", x: a.position - len - 3, y: v + a.tickPx * 0.35, runs: t.label, size: a.tickPx, color: ink, anchor: "end" });
      }
    }
  }
  const title = titleText(a);
  if (title.length) {
    const size = titlePx(a, fontPx);
    const standoff = Number(s.title?.standoff ?? 4);
    if (a.letter === "x") {
      const below = belowX(a, fontPx);
      out.push({ type: "text", x: (lo + hi) / 2, y: a.position + len + below.labels + standoff + size * 0.85, runs: title, size, color: ink, anchor: "middle" });
    } else {
      const left = leftOfY(a, fontPx);
      out.push({ type: "text", x: a.position - len - left.labels - standoff - size * 0.25, y: (lo + hi) / 2, runs: title, size, color: ink, anchor: "middle", rotate: -90 });
    }
  }
  return out;
}

/* --------------------------------------------------------------- traces */

function dashArray(dash: unknown, width: number): number[] | undefined {
  const d = Math.max(width, 3);
  switch (dash) {
    case "dot": return [d, d];
    case "dash": return [3 * d, 3 * d];
    case "longdash": return [5 * d, 5 * d];
    case "dashdot": return [3 * d, d, d, d];
    case "longdashdot": return [5 * d, 2 * d, d, 2 * d];
    default: return undefined;
  }
}

/** Pixel points of a trace (null where x or y is missing: a gap). */
function tracePoints(trace: Loose, xa: Axis, ya: Axis): ([number, number] | null)[] {
  const xs = (trace.x ?? []) as unknown[], ys = (trace.y ?? []) as unknown[];
  const out: ([number, number] | null)[] = [];
  for (let i = 0; i < Math.min(xs.length, ys.length); i++) {
    const x = xs[i], y = ys[i];
    out.push(isNum(x) && isNum(y) ? [toPx(xa, x), toPx(ya, y)] : null);
  }
  return out;
}

/**
 * How far (px) a drawn line may pass from a point it leaves out: 0.02 px is 5 µm on an 85 mm
 * figure, a tenth of a dot at 600 dpi, so the line looks the same, and a smooth 4096-point
 * model curve keeps a few hundred vertices (each one a round join for the rasteriser).
 */
const LINE_TOLERANCE = 0.02;

function linePath(points: ([number, number] | null)[]): PathBuilder {
  const p = new PathBuilder();
  let run: [number, number][] = [];
  const flush = () => {
    simplifyPolyline(run, LINE_TOLERANCE).forEach(([x, y], i) => (i ? p.line(x, y) : p.move(x, y)));
    run = [];
  };
  for (const pt of points) {
    if (pt) run.push(pt);
    else flush();
  }
  flush();
  return p;
}

/**
 * The vertices of a polyline that keep every left-out vertex within `tolerance` of the segment
 * drawn past it, first and last always kept. One pass (sleeve fitting, after Zhao & Saalfeld,
 * AutoCarto 13, 1997): from the last kept vertex, the directions that pass within `tolerance`
 * of every vertex since form a cone; a vertex can end the segment while its direction stays in
 * that cone and it lies farther out than every vertex before it (so none is passed by the
 * segment's end). Runs once per figure, mostly before the JIT compiles it, hence one pass.
 * @param tolerance largest distance (px) of a left-out vertex from the simplified line
 */
export function simplifyPolyline(points: [number, number][], tolerance: number): [number, number][] {
  const n = points.length;
  if (n <= 2) return points;
  const out: [number, number][] = [points[0]!];
  let anchor = 0;
  // Cone of allowed directions from the anchor: unit vectors (lx, ly) … (rx, ry), counter-clockwise; open = no limit yet.
  let open = true, lx = 0, ly = 0, rx = 0, ry = 0, farthest = 0;
  let ax = points[0]![0], ay = points[0]![1];
  for (let j = 1; j < n; j++) {
    // Index access, not destructuring: unoptimised code runs destructuring through the iterator protocol.
    const p = points[j]!;
    const vx = p[0] - ax, vy = p[1] - ay, d = Math.sqrt(vx * vx + vy * vy);
    const ux = d > 0 ? vx / d : 1, uy = d > 0 ? vy / d : 0;
    const ends = j === anchor + 1 || (d >= farthest && (open || (lx * uy - ly * ux >= 0 && ux * ry - uy * rx >= 0)));
    if (!ends) {
      // j cannot end a segment from the anchor: keep j − 1 and start again from it.
      anchor = j - 1;
      out.push(points[anchor]!);
      ax = points[anchor]![0]; ay = points[anchor]![1];
      open = true; farthest = 0;
      j = anchor; // the loop's j++ takes up j again, now from the new anchor
      continue;
    }
    farthest = Math.max(farthest, d);
    if (d <= tolerance) continue; // within reach of the anchor itself: no limit on directions
    // Directions within asin(tolerance / d) of (ux, uy): rotate it by ∓ that angle.
    const sin = tolerance / d, cos = Math.sqrt(1 - sin * sin);
    const r2x = ux * cos + uy * sin, r2y = -ux * sin + uy * cos; // clockwise edge
    const l2x = ux * cos - uy * sin, l2y = ux * sin + uy * cos; // counter-clockwise edge
    if (open) { lx = r2x; ly = r2y; rx = l2x; ry = l2y; open = false; continue; }
    // Intersect: the later of the two clockwise edges, the earlier of the two counter-clockwise ones.
    if (lx * r2y - ly * r2x > 0) { lx = r2x; ly = r2y; }
    if (rx * l2y - ry * l2x < 0) { rx = l2x; ry = l2y; }
  }
  if (out[out.length - 1] !== points[n - 1]) out.push(points[n - 1]!);
  return out;
}

function scatterItems(trace: Loose, xa: Axis, ya: Axis, before: Loose | undefined): SceneItem[] {
  const out: SceneItem[] = [];
  const mode = String(trace.mode ?? "lines+markers");
  const points = tracePoints(trace, xa, ya);
  const line = (trace.line ?? {}) as Loose;
  const lineWidth = line.width === undefined ? 2 : Number(line.width);
  if (trace.fill === "tonexty" && before) {
    const lowerPts = tracePoints(before, xa, ya).filter((p): p is [number, number] => p !== null);
    const upperPts = points.filter((p): p is [number, number] => p !== null);
    if (lowerPts.length && upperPts.length) {
      const p = new PathBuilder();
      upperPts.forEach(([x, y], i) => (i ? p.line(x, y) : p.move(x, y)));
      for (let i = lowerPts.length - 1; i >= 0; i--) p.line(lowerPts[i]![0], lowerPts[i]![1]);
      p.close();
      const c = parseColor(trace.fillcolor ?? "rgba(0,0,0,0.2)");
      out.push({ type: "path", d: p.toString(), fill: c.hex, fillOpacity: c.alpha, bounds: p.bounds() });
    }
  }
  const error = trace.error_y as Loose | undefined;
  if (error && error.visible !== false && Array.isArray(error.array)) {
    const p = new PathBuilder();
    const half = Number(error.width ?? 4);
    const ys = trace.y as unknown[];
    points.forEach((pt, i) => {
      const e = error.array[i], y = ys[i];
      if (!pt || !isNum(e) || !isNum(y)) return;
      const top = toPx(ya, y + Math.abs(e)), bottom = toPx(ya, y - Math.abs(e));
      p.move(pt[0], top).line(pt[0], bottom);
      if (half > 0) p.move(pt[0] - half, top).line(pt[0] + half, top).move(pt[0] - half, bottom).line(pt[0] + half, bottom);
    });
    const c = parseColor(error.color ?? "#444444");
    if (!p.empty) out.push({ type: "path", d: p.toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: Number(error.thickness ?? 2), bounds: p.bounds() });
  }
  if (mode.includes("lines") && lineWidth > 0) {
    const c = parseColor(line.color ?? "#1f77b4");
    const p = linePath(points);
    if (!p.empty) out.push({ type: "path", d: p.toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: lineWidth, dash: dashArray(line.dash, lineWidth), join: "round", bounds: p.bounds() });
  }
  if (mode.includes("markers")) {
    const marker = markerPath(trace.marker ?? {}, points.filter((p): p is [number, number] => p !== null));
    if (marker) out.push(marker);
  }
  return out;
}

/** One path for all markers of a trace: discs as round-capped dots, crosses as two strokes. */
function markerPath(marker: Loose, points: [number, number][]): PathItem | null {
  if (!points.length) return null;
  const size = Number(marker.size ?? 6);
  const p = new PathBuilder();
  if (String(marker.symbol ?? "circle").startsWith("x")) {
    const h = size / 2;
    for (const [x, y] of points) p.move(x - h, y - h).line(x + h, y + h).move(x - h, y + h).line(x + h, y - h);
    const c = parseColor(marker.line?.color ?? marker.color ?? "#444444");
    return { type: "path", d: p.toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: Number(marker.line?.width ?? 1), cap: "butt", bounds: p.bounds() };
  }
  for (const [x, y] of points) p.dot(x, y);
  const c = parseColor(marker.color ?? "#1f77b4");
  return { type: "path", d: p.toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: size, cap: "round", bounds: p.bounds() };
}

function rectPath(x: number, y: number, w: number, h: number): string {
  return new PathBuilder().move(x, y).line(x + w, y).line(x + w, y + h).line(x, y + h).close().toString();
}

function heatmapItems(trace: Loose, xa: Axis, ya: Axis): SceneItem[] {
  const z = (trace.z ?? []) as unknown[][];
  const scale = (Array.isArray(trace.colorscale) ? trace.colorscale : [[0, "#ffffff"], [1, "#000000"]]) as [number, string][];
  const zmin = Number(trace.zmin ?? -1), zmax = Number(trace.zmax ?? 1);
  const gx = Number(trace.xgap ?? 0) / 2, gy = Number(trace.ygap ?? 0) / 2;
  const byColor = new Map<string, PathBuilder>();
  z.forEach((row, r) => row.forEach((v, c) => {
    if (!isNum(v)) return;
    const color = scaleColor(scale, (v - zmin) / (zmax - zmin || 1));
    const x0 = toPx(xa, c - 0.5), x1 = toPx(xa, c + 0.5), y0 = toPx(ya, r - 0.5), y1 = toPx(ya, r + 0.5);
    const left = Math.min(x0, x1) + gx, right = Math.max(x0, x1) - gx, top = Math.min(y0, y1) + gy, bottom = Math.max(y0, y1) - gy;
    const p = byColor.get(color) ?? new PathBuilder();
    p.move(left, top).line(right, top).line(right, bottom).line(left, bottom).close();
    byColor.set(color, p);
  }));
  return [...byColor].map(([fill, p]) => ({ type: "path", d: p.toString(), fill }) as PathItem);
}

function colorbarWidth(trace: Loose, plotWidth: number, fontPx: number): number {
  const cb = trace.colorbar as Loose;
  const tickPx = Number(cb.tickfont?.size) || fontPx;
  const labels = colorbarTicks(cb).map((v) => runsWidth(parseMarkup(tickLabel(v)), tickPx));
  const title = cb.title?.text ? fontPx * 1.3 + 4 : 0;
  return 0.02 * plotWidth + 10 + Number(cb.thickness ?? 30) + Number(cb.ticklen ?? 5) + 3 + Math.max(0, ...labels) + title;
}

function colorbarTicks(cb: Loose): number[] {
  return Array.isArray(cb.tickvals) ? (cb.tickvals as unknown[]).filter(isNum) : [-1, -0.5, 0, 0.5, 1];
}

function colorbarItems(trace: Loose, plot: { x: number; y: number; width: number; height: number }, fontPx: number, ink: string): SceneItem[] {
  const cb = trace.colorbar as Loose;
  const out: SceneItem[] = [];
  const scale = trace.colorscale as [number, string][];
  const zmin = Number(trace.zmin ?? -1), zmax = Number(trace.zmax ?? 1);
  const thickness = Number(cb.thickness ?? 30);
  const len = Number(cb.len ?? 1) * plot.height;
  const x0 = plot.x + plot.width * 1.02 + 10;
  const top = plot.y + (plot.height - len) / 2;
  const steps = 64;
  for (let i = 0; i < steps; i++) {
    const t = (i + 0.5) / steps;
    const y1 = top + len * (1 - i / steps), y0 = top + len * (1 - (i + 1) / steps);
    // Each step overlaps the next by a little so no seam shows between them.
    out.push({ type: "path", d: rectPath(x0, y0 - (i < steps - 1 ? 0.3 : 0), thickness, y1 - y0 + (i < steps - 1 ? 0.3 : 0)), fill: scaleColor(scale, t) });
  }
  const tickPx = Number(cb.tickfont?.size) || fontPx;
  const ticklen = cb.ticks === "outside" ? Number(cb.ticklen ?? 5) : 0;
  const p = new PathBuilder();
  let widest = 0;
  for (const v of colorbarTicks(cb)) {
    const y = top + len * (1 - (v - zmin) / (zmax - zmin));
    if (ticklen) p.move(x0 + thickness, y).line(x0 + thickness + ticklen, y);
    const label = parseMarkup(tickLabel(v));
    widest = Math.max(widest, runsWidth(label, tickPx));
    out.push({ type: "text", x: x0 + thickness + ticklen + 3, y: y + tickPx * 0.35, runs: label, size: tickPx, color: ink, anchor: "start" });
  }
  if (!p.empty) out.push({ type: "path", d: p.toString(), stroke: ink, strokeWidth: 1 });
  if (cb.title?.text) {
    out.push({ type: "text", x: x0 + thickness + ticklen + 3 + widest + 4 + fontPx * 0.8, y: top + len / 2, runs: parseMarkup(String(cb.title.text)), size: fontPx, color: ink, anchor: "middle", rotate: -90 });
  }
  return out;
}

/* ------------------------------------------------- shapes, annotations */

type Plot = { x: number; y: number; width: number; height: number };

/** Pixel of coordinate `v` given in reference `ref` ("paper", "x2", "x2 domain", ...). */
function refPx(ref: unknown, v: unknown, letter: "x" | "y", axes: Map<string, Axis>, plot: Plot): number | null {
  const r = typeof ref === "string" ? ref : "paper";
  if (r === "paper") {
    if (!isNum(v)) return null;
    return letter === "x" ? plot.x + v * plot.width : plot.y + (1 - v) * plot.height;
  }
  const m = /^([xy]\d*)( domain)?$/.exec(r);
  const axis = m ? axes.get(m[1]!) : undefined;
  if (!axis) return null;
  if (m![2]) return isNum(v) ? axis.p0 + v * (axis.p1 - axis.p0) * (axis.spec.autorange === "reversed" ? -1 : 1) + (axis.spec.autorange === "reversed" ? axis.p1 - axis.p0 : 0) : null;
  if (axis.categories && typeof v === "string") {
    const i = axis.categories.indexOf(v);
    return i < 0 ? null : toPx(axis, i);
  }
  return isNum(v) ? toPx(axis, v) : null;
}

function shapeItems(layout: Loose, axes: Map<string, Axis>, plot: Plot): SceneItem[] {
  const out: SceneItem[] = [];
  for (const s of (Array.isArray(layout.shapes) ? layout.shapes : []) as Loose[]) {
    if (s.type !== "line" && s.type !== "rect") continue;
    const x0 = refPx(s.xref, s.x0, "x", axes, plot), x1 = refPx(s.xref, s.x1, "x", axes, plot);
    const y0 = refPx(s.yref, s.y0, "y", axes, plot), y1 = refPx(s.yref, s.y1, "y", axes, plot);
    if (x0 === null || x1 === null || y0 === null || y1 === null) continue;
    const line = (s.line ?? {}) as Loose;
    const width = Number(line.width ?? 2);
    const c = parseColor(line.color ?? "#444444");
    const d = s.type === "line" ? new PathBuilder().move(x0, y0).line(x1, y1).toString() : rectPath(Math.min(x0, x1), Math.min(y0, y1), Math.abs(x1 - x0), Math.abs(y1 - y0));
    const fill = s.type === "rect" ? parseColor(s.fillcolor) : undefined;
    out.push({
      type: "path", d, ...(fill && fill.alpha > 0 ? { fill: fill.hex, fillOpacity: fill.alpha } : {}),
      ...(width > 0 ? { stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: width, dash: dashArray(line.dash, width) } : {}),
    });
  }
  return out;
}

function annotationItems(layout: Loose, axes: Map<string, Axis>, plot: Plot, fontPx: number, ink: string): SceneItem[] {
  const out: SceneItem[] = [];
  for (const a of (Array.isArray(layout.annotations) ? layout.annotations : []) as Loose[]) {
    const x = refPx(a.xref ?? "x", a.x, "x", axes, plot), y = refPx(a.yref ?? "y", a.y, "y", axes, plot);
    if (x === null || y === null || typeof a.text !== "string") continue;
    const size = Number(a.font?.size) || fontPx;
    const color = parseColor(a.font?.color ?? ink).hex;
    const anchor = a.xanchor === "left" ? "start" : a.xanchor === "right" ? "end" : "middle";
    const baseline = a.yanchor === "top" ? y + size * 0.8 : a.yanchor === "bottom" ? y - size * 0.25 : y + size * 0.35;
    out.push({ type: "text", x: x + (anchor === "start" ? 2 : anchor === "end" ? -2 : 0), y: baseline, runs: parseMarkup(a.text), size, color, anchor });
  }
  return out;
}

/* --------------------------------------------------------------- legend */

interface Legend {
  items: { trace: Loose; runs: TextRun[]; width: number }[];
  above: boolean;
  fontPx: number;
}

const SAMPLE = 40; // px of each legend entry before its text (line sample from 5 to 35)

function legendItems(layout: Loose, data: Loose[], fontPx: number): Legend {
  const spec = (layout.legend ?? {}) as Loose;
  const size = Number(spec.font?.size) || fontPx;
  const above = spec.orientation === "h" && (spec.y ?? 1) >= 1;
  if (layout.showlegend === false) return { items: [], above, fontPx: size };
  let traces = data.filter((t) => t.visible !== false && t.showlegend !== false && t.type !== "heatmap" && typeof t.name === "string");
  // plotly lists a vertical legend bottom-up when the traces stack fills (bands)
  if (spec.orientation !== "h" && data.some((t) => String(t.fill ?? "").startsWith("tonext"))) traces = traces.reverse();
  return {
    items: traces.map((trace) => {
      const runs = parseMarkup(trace.name as string);
      return { trace, runs, width: SAMPLE + runsWidth(runs, size) };
    }),
    above,
    fontPx: size,
  };
}

function rowHeight(fontPx: number): number {
  return Math.round(fontPx * 1.6);
}

/** Rows of a horizontal legend that fits `width` px (entries wrap to a new row). */
function legendRows(legend: Legend, width: number): Legend["items"][] {
  const rows: Legend["items"][] = [[]];
  let used = 0;
  for (const item of legend.items) {
    const w = item.width + 10;
    if (used > 0 && used + w > width) { rows.push([]); used = 0; }
    rows[rows.length - 1]!.push(item);
    used += w;
  }
  return rows;
}

function legendHeight(legend: Legend, width: number, _fontPx: number): number {
  return legendRows(legend, width).length * rowHeight(legend.fontPx) + 2;
}

function legendDrawing(legend: Legend, layout: Loose, plot: Plot, _fontPx: number, ink: string): SceneItem[] {
  const spec = (layout.legend ?? {}) as Loose;
  const rowH = rowHeight(legend.fontPx);
  const out: SceneItem[] = [];
  const entry = (item: Legend["items"][number], x: number, yMid: number) => {
    out.push(...legendSample(item.trace, x, yMid));
    out.push({ type: "text", x: x + SAMPLE, y: yMid + legend.fontPx * 0.35, runs: item.runs, size: legend.fontPx, color: ink, anchor: "start" });
  };
  if (legend.above || spec.orientation === "h") {
    const rows = legendRows(legend, plot.width);
    const bottom = plot.y - 2;
    const top = bottom - rows.length * rowH;
    rows.forEach((row, r) => {
      let x = plot.x + Number(spec.x ?? 0) * plot.width;
      for (const item of row) { entry(item, x, top + (r + 0.5) * rowH); x += item.width + 10; }
    });
    return out;
  }
  const boxW = Math.max(...legend.items.map((i) => i.width)) + 8;
  const boxH = legend.items.length * rowH + 6;
  const ax = plot.x + Number(spec.x ?? 1.02) * plot.width, ay = plot.y + (1 - Number(spec.y ?? 1)) * plot.height;
  const left = spec.xanchor === "right" ? ax - boxW : spec.xanchor === "center" ? ax - boxW / 2 : ax;
  const top = spec.yanchor === "bottom" ? ay - boxH : spec.yanchor === "middle" ? ay - boxH / 2 : ay;
  legend.items.forEach((item, i) => entry(item, left + 2, top + 3 + (i + 0.5) * rowH));
  return out;
}

/** The legend symbol of a trace: band swatch, line sample and/or marker, in the trace's style. */
function legendSample(trace: Loose, x: number, y: number): SceneItem[] {
  const out: SceneItem[] = [];
  const mode = String(trace.mode ?? "lines+markers");
  const line = (trace.line ?? {}) as Loose;
  const width = line.width === undefined ? 2 : Number(line.width);
  if (String(trace.fill ?? "none") !== "none") {
    const c = parseColor(trace.fillcolor ?? "rgba(0,0,0,0.2)");
    out.push({ type: "path", d: rectPath(x + 5, y - 4, 30, 8), fill: c.hex, fillOpacity: c.alpha });
  }
  if (mode.includes("lines") && width > 0) {
    const c = parseColor(line.color ?? "#1f77b4");
    out.push({ type: "path", d: new PathBuilder().move(x + 5, y).line(x + 35, y).toString(), stroke: c.hex, strokeOpacity: c.alpha, strokeWidth: Math.min(width, 5), dash: dashArray(line.dash, width) });
  }
  if (mode.includes("markers")) {
    const m = markerPath(trace.marker ?? {}, [[x + 20, y]]);
    if (m) out.push(m);
  }
  return out;
}
