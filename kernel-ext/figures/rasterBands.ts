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
import type { GroupItem, Scene, SceneItem } from "../../src/report/render/scene.js";
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
    svg: sceneToSvg({ ...scene, items: scene.items.filter(keep) }, { width, height: rows, viewBox: [-tx / s, (rowStart - ty) / s, width / s, rows / s] }),
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
