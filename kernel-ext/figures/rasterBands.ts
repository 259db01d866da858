/**
 * How a figure is cut into horizontal bands for rasterising on several threads at once.
 *
 * resvg's time goes mostly into the geometry of the data paths (thousands of round markers),
 * not into pixels: a band that contains a heavy path pays for all of it even if it shows a
 * sliver. So bands are cut only in the gaps between the figure's clipped panels (a fit figure:
 * data panel above, residual panel below), and each band's document leaves out the panels it
 * does not touch. Everything else (axes, ticks, text: cheap) goes into every band and is cut
 * by the band's edges. No Node or DOM imports: a plan is plain data.
 */
import { r1, type GroupItem, type PathItem, type Scene, type SceneItem } from "../../src/report/render/scene.js";
import { sceneToSvg } from "../../src/report/render/svg.js";

/** One band of the raster: pixel rows [rowStart, rowStart + rows) and the SVG that draws them. */
export interface RasterBand {
  rowStart: number;
  rows: number;
  /** A document `width` × `rows` px showing exactly those rows of the figure. */
  svg: string;
}

/** Bands are worth their fixed cost only when the lighter side still holds this share of the path data. */
const MIN_SHARE = 0.2;
/** Path text (characters) below which one band is drawn: a small figure draws in a few ms anyway. */
const MIN_PATH_TEXT = 20_000;

/**
 * Cut `scene`, drawn `width` × `height` px (scaled uniformly and centred, as an SVG viewer
 * does with the scene's viewBox), into at most `maxBands` bands (2 at most are planned: one
 * gap between panels is cut), balancing the panels' path data between them.
 * @param width raster width (px)
 * @param height raster height (px)
 * @returns bands in top-to-bottom order covering rows 0 … height − 1 exactly once
 */
export function planRasterBands(scene: Scene, width: number, height: number, maxBands = 2): RasterBand[] {
  const s = Math.min(width / scene.width, height / scene.height);
  const tx = (width - scene.width * s) / 2, ty = (height - scene.height * s) / 2;
  const toRow = (y: number) => ty + y * s;
  const band = (rowStart: number, rows: number, keep: (item: SceneItem) => boolean): RasterBand => ({
    rowStart,
    rows,
    svg: sceneToSvg({ ...scene, items: openClips(scene.items.filter(keep), scene.background) }, { width, height: rows, viewBox: [-tx / s, (rowStart - ty) / s, width / s, rows / s] }),
  });
  const split = maxBands >= 2 ? bestSplit(scene, toRow, height) : undefined;
  if (split === undefined) return [band(0, height, () => true)];
  // A panel is left out of a band its clip rectangle (plus a pixel for antialiasing) does not reach.
  const reaches = (item: SceneItem, from: number, to: number) =>
    item.type !== "group" || (toRow(item.clip.y + item.clip.height) + 1 > from && toRow(item.clip.y) - 1 < to);
  return [band(0, split, (item) => reaches(item, 0, split)), band(split, height - split, (item) => reaches(item, split, height))];
}

/** The pixel row between two panels that best balances their path data, or undefined when no cut pays. */
function bestSplit(scene: Scene, toRow: (y: number) => number, height: number): number | undefined {
  const panels = scene.items
    .filter((item): item is GroupItem => item.type === "group")
    .map((group) => ({ top: toRow(group.clip.y), bottom: toRow(group.clip.y + group.clip.height), weight: pathText(group.items) }))
    .sort((a, b) => a.top - b.top);
  const total = panels.reduce((sum, p) => sum + p.weight, 0);
  if (total < MIN_PATH_TEXT) return undefined;
  let best: { row: number; lighter: number } | undefined;
  for (let i = 1; i < panels.length; i++) {
    const above = panels.slice(0, i), below = panels.slice(i);
    const gapTop = Math.max(...above.map((p) => p.bottom)), gapBottom = Math.min(...below.map((p) => p.top));
    if (gapBottom - gapTop < 4) continue; // panels that touch or overlap: no clean cut
    const row = Math.round((gapTop + gapBottom) / 2);
    if (row <= 0 || row >= height) continue;
    const weightAbove = above.reduce((sum, p) => sum + p.weight, 0);
    const lighter = Math.min(weightAbove, total - weightAbove) / total;
    if (lighter >= MIN_SHARE && (!best || lighter > best.lighter)) best = { row, lighter };
  }
  return best?.row;
}

/** Characters of path data in `items`: a proxy for resvg's geometry work. */
function pathText(items: SceneItem[]): number {
  let n = 0;
  for (const item of items) n += item.type === "path" ? item.d.length : item.type === "group" ? pathText(item.items) : 0;
  return n;
}

/** Widest overflow (px) of a panel's drawing past its clip rectangle that a frame of background is painted over. */
const MAX_OVERFLOW = 12;

/**
 * resvg draws a clipped group on a layer the size of the group and masks it: for a panel, two
 * extra canvases as large as the panel (~25 % of a 600 dpi fit figure's drawing time). A panel
 * whose drawing reaches at most MAX_OVERFLOW px past its clip rectangle, drawn over nothing but
 * the background (only panels come before it), is drawn unclipped and then framed: the four
 * strips around the clip rectangle, as wide as the overflow, are painted in the opaque
 * background colour. Over a background the result is the clipped drawing: a pixel on the clip
 * edge gets the same share of background either way. Any other group keeps its clip.
 */
export function openClips(items: SceneItem[], background: string): SceneItem[] {
  if (!/^#[0-9a-f]{6}$/i.test(background)) return items;
  const out: SceneItem[] = [];
  const earlier: GroupItem["clip"][] = [];
  let onlyPanelsBefore = true;
  for (const item of items) {
    if (item.type !== "group") {
      onlyPanelsBefore = false;
      out.push(item);
      continue;
    }
    const c = item.clip;
    const overflow = onlyPanelsBefore ? overflowPast(item) : undefined;
    const m = overflow === undefined ? undefined : overflow + 1; // a pixel more for the antialiased edge
    const frame = m === undefined ? undefined : { x: c.x - m, y: c.y - m, width: c.width + 2 * m, height: c.height + 2 * m };
    if (!frame || m! > MAX_OVERFLOW + 1 || earlier.some((e) => overlaps(frame, e))) out.push(item);
    else {
      out.push(...item.items, frameAround(c, m!, background));
    }
    earlier.push(c);
  }
  return out;
}

/** How far (px) the group's paths reach past its clip rectangle, strokes included; undefined when not known. */
function overflowPast(group: GroupItem): number | undefined {
  const c = group.clip;
  let overflow = 0;
  for (const item of group.items) {
    if (item.type !== "path" || !item.bounds) return undefined;
    const b = item.bounds, reach = strokeReach(item);
    overflow = Math.max(overflow, c.x - (b.x0 - reach), b.x1 + reach - (c.x + c.width), c.y - (b.y0 - reach), b.y1 + reach - (c.y + c.height));
  }
  return overflow;
}

/** How far (px) a path's paint reaches past its points: half the stroke, times the miter limit (SVG's default 4) for mitred joins. */
function strokeReach(path: PathItem): number {
  if (path.stroke === undefined || !((path.strokeWidth ?? 1) > 0)) return 0;
  const half = (path.strokeWidth ?? 1) / 2;
  return path.join === "round" ? half : 4 * half;
}

function overlaps(a: GroupItem["clip"], b: GroupItem["clip"]): boolean {
  return a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
}

/**
 * The strips of width m around clip rectangle c as one filled path: the outer box clockwise and
 * c (as the SVG writes it, to 0.1 px) counter-clockwise, a hole by the nonzero rule. One path,
 * so no seam between strips shows through their antialiased edges.
 */
function frameAround(c: GroupItem["clip"], m: number, color: string): PathItem {
  const x = r1(c.x), y = r1(c.y), w = r1(c.width), h = r1(c.height);
  const outer = `M${x - m} ${y - m}H${x + w + m}V${y + h + m}H${x - m}Z`;
  const inner = `M${x} ${y}V${y + h}H${x + w}V${y}Z`;
  return { type: "path", d: outer + inner, fill: color };
}
