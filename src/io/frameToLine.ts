/**
 * Camera frame → line profile: region of interest, dark subtraction, flat-field division,
 * hot-pixel repair, saturation mask, fringe tilt measured and undone, rows averaged with a
 * per-pixel σ.
 */
import { DataError, InvalidArgumentError } from "../errors.js";
import { TOP_CODES, flaggedRanges } from "./findSaturation.js";
import type { ImageStack } from "./imageTypes.js";
import { averageRows } from "./averageRows.js";
import { measureTilt } from "./measureTilt.js";
import { repairHotPixels } from "./repairHotPixels.js";

/** Rectangle in pixels (0-based column and row of the top-left corner, size). */
export interface RegionOfInterest {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** Options for frameToLine. */
export interface FrameOptions {
  /** File name for messages (default "frame"). */
  source?: string;
  /** Region of interest; default the whole frame. */
  roi?: RegionOfInterest;
  /** Page of a stack (1 = first) or "mean" of all pages (default). */
  page?: number | "mean";
  /** Dark frame (same size) subtracted before anything else. */
  dark?: ImageStack;
  /** Flat field (same size), divided out after normalising it to mean 1 over the ROI. */
  flat?: ImageStack;
  /** Fringe tilt (rad) to undo, or "auto" to measure it (default); 0 leaves rows as they are. */
  tilt?: number | "auto";
  /** Mask samples that involve saturated pixels (default true). */
  maskSaturated?: boolean;
  /** Replace isolated hot pixels by the mean of their neighbours (default true). */
  repairHotPixels?: boolean;
}

/** A profile along the fringe normal, in pixel units. */
export interface LineProfile {
  /** Position along the fringe normal (pixels, same origin as the frame's columns). */
  pixel: Float64Array;
  /** Mean intensity over the rows (detector codes minus dark, divided by flat). */
  y: Float64Array;
  /** Standard uncertainty of each mean (same unit as y). */
  sigma: Float64Array;
  /** 1 = usable, 0 = masked (saturated, or too few rows). */
  mask: Uint8Array;
  /** Tilt undone (rad). */
  tilt: number;
  notes: string[];
  warnings: string[];
  /** Coded warnings every fit of this profile repeats (saturated-masked / saturated-kept). */
  coded?: { code: string; message: string }[];
  /** Options used, for provenance. */
  options: Record<string, unknown>;
}

/**
 * Turns a frame into a line profile. σ of each averaged sample comes from the mean square
 * second difference between rows (see averageRows), which ignores slow changes of intensity
 * along the fringes.
 * @param stack   decoded image (one or more pages)
 * @param options region, page, dark, flat, tilt, masking
 */
export function frameToLine(stack: ImageStack, options: FrameOptions = {}): LineProfile {
  const source = options.source ?? "frame";
  const roi = checkRoi(options.roi ?? { x: 0, y: 0, width: stack.width, height: stack.height }, stack);
  const { width: w, height: h } = roi;
  const notes: string[] = [...stack.notes];
  const warnings: string[] = [];
  const pages = choosePages(stack, options.page);
  const values = new Float32Array(w * h);
  const saturated = new Uint8Array(w * h);
  let saturatedCount = 0;
  const top = stack.integerCodes ? saturationCode(pages, roi, stack) : undefined;
  const topValue = top ?? NaN;
  const weight = 1 / pages.length;
  for (const page of pages) saturatedCount += accumulateRoi(page, stack.width, roi, weight, topValue, values, saturated);
  if (pages.length > 1) notes.push(`mean of ${pages.length} pages`);
  if (options.dark) {
    const dark = meanRoi(options.dark, roi, stack, source, "dark frame");
    for (let i = 0; i < values.length; i++) values[i] = (values[i] as number) - (dark[i] as number);
    notes.push("dark frame subtracted");
  }
  if (options.flat) {
    const flat = meanRoi(options.flat, roi, stack, source, "flat field");
    let sum = 0;
    for (let i = 0; i < flat.length; i++) sum += flat[i] as number;
    const mean = sum / flat.length;
    if (!(mean > 0)) throw new DataError(source, "the flat field has no positive mean over the region of interest", "record the flat field with light on the detector");
    let bad = 0;
    for (let i = 0; i < values.length; i++) {
      const gain = (flat[i] as number) / mean;
      if (gain > 0.05) values[i] = (values[i] as number) / gain;
      else if (saturated[i] === 0) {
        saturated[i] = 2;
        bad++;
      }
    }
    notes.push("divided by the flat field (normalised to mean 1)");
    if (bad > 0) warnings.push(`${bad} pixels with a flat-field gain below 5 % were masked`);
  }
  const hot = options.repairHotPixels === false ? [] : repairHotPixels(values, w, h, saturated);
  if (hot.length > 0) {
    const where = hot.slice(0, 5).map(([c, r]) => `(${roi.x + c}, ${roi.y + r})`).join(", ");
    warnings.push(`${hot.length} hot pixels replaced by the mean of their neighbours at (column, row) ${where}${hot.length > 5 ? ", ..." : ""}`);
  }
  const tilt = options.tilt === undefined || options.tilt === "auto" ? measureTilt(values, w, h, saturated) : options.tilt;
  if (!Number.isFinite(tilt) || Math.abs(tilt) >= Math.PI / 4) throw new InvalidArgumentError("tilt", tilt, "an angle in radians between −π/4 and π/4, or \"auto\"");
  if (options.tilt === undefined || options.tilt === "auto") notes.push(`fringe tilt ${(tilt * 180 / Math.PI).toFixed(3)}° measured and undone`);
  // Integer codes carry at least the quantisation variance 1/12 code² (uniform rounding error).
  const line = averageRows(values, saturated, roi, tilt, options.maskSaturated !== false, 0, stack.integerCodes ? 1 / 12 : 0);
  const coded: { code: string; message: string }[] = [];
  if (saturatedCount > 0) {
    const cols = flaggedRanges(line.saturatedFlag).slice(0, 3).map(([a, b]) => (a === b ? `${line.pixel[a]!.toFixed(0)}` : `${line.pixel[a]!.toFixed(0)}–${line.pixel[b]!.toFixed(0)}`)).join(", ");
    const message = options.maskSaturated === false
      ? `${saturatedCount} saturated pixels (code ${top}) at pixel ${cols}; not masked`
      : `${saturatedCount} saturated pixels (code ${top}) masked: ${line.masked} profile samples at pixel ${cols}`;
    warnings.push(message);
    coded.push({ code: options.maskSaturated === false ? "saturated-kept" : "saturated-masked", message });
  }
  const optionsUsed: Record<string, unknown> = { format: stack.format, roi, page: options.page ?? "mean", tilt, dark: options.dark !== undefined, flat: options.flat !== undefined, maskSaturated: options.maskSaturated !== false };
  return { pixel: line.pixel, y: line.y, sigma: line.sigma, mask: line.mask, tilt, notes, warnings, coded, options: optionsUsed };
}

/** Adds weight × the ROI of one page to `values` and flags pixels at the top code; returns how many were newly flagged. */
function accumulateRoi(page: ArrayLike<number>, stride: number, roi: RegionOfInterest, weight: number, top: number, values: Float32Array, flags: Uint8Array): number {
  let flagged = 0;
  const w = roi.width;
  for (let r = 0; r < roi.height; r++) {
    const from = (roi.y + r) * stride + roi.x;
    const to = r * w;
    for (let c = 0; c < w; c++) {
      const v = page[from + c]!;
      values[to + c] += v * weight;
      if (v === top && flags[to + c] === 0) {
        flags[to + c] = 1;
        flagged++;
      }
    }
  }
  return flagged;
}

/** The detector top code reached in the ROI (a plateau of ≥ 2 pixels at 255, 4095, 65535, ...). */
function saturationCode(pages: ImageStack["pages"], roi: RegionOfInterest, stack: ImageStack): number | undefined {
  let max = -Infinity;
  let count = 0;
  for (const page of pages) {
    for (let r = 0; r < roi.height; r++) {
      const from = (roi.y + r) * stack.width + roi.x;
      for (let c = 0; c < roi.width; c++) {
        const v = page[from + c] as number;
        if (v > max) { max = v; count = 1; } else if (v === max) count++;
      }
    }
  }
  return count >= 2 && (TOP_CODES as readonly number[]).concat(stack.topCode ?? []).includes(max) ? max : undefined;
}
function checkRoi(roi: RegionOfInterest, stack: ImageStack): RegionOfInterest {
  const ok = [roi.x, roi.y, roi.width, roi.height].every((v) => Number.isInteger(v)) && roi.x >= 0 && roi.y >= 0 && roi.width >= 3 && roi.height >= 1 && roi.x + roi.width <= stack.width && roi.y + roi.height <= stack.height;
  if (!ok) throw new InvalidArgumentError("roi", `${roi.x},${roi.y},${roi.width},${roi.height}`, `x,y,width,height in whole pixels inside the ${stack.width} × ${stack.height} frame, width ≥ 3`);
  return roi;
}

function choosePages(stack: ImageStack, page: number | "mean" | undefined): ImageStack["pages"] {
  if (page === undefined || page === "mean") return stack.pages;
  if (!Number.isInteger(page) || page < 1 || page > stack.pages.length) throw new InvalidArgumentError("page", page, `a page number from 1 to ${stack.pages.length}, or "mean"`);
  return [stack.pages[page - 1]!];
}

function meanRoi(other: ImageStack, roi: RegionOfInterest, stack: ImageStack, source: string, what: string): Float32Array {
  if (other.width !== stack.width || other.height !== stack.height) {
    throw new DataError(source, `the ${what} is ${other.width} × ${other.height} but the frame is ${stack.width} × ${stack.height}`, `give a ${what} recorded with the same camera settings`);
  }
  const out = new Float32Array(roi.width * roi.height);
  for (const page of other.pages) {
    for (let r = 0; r < roi.height; r++) {
      const from = (roi.y + r) * other.width + roi.x;
      for (let c = 0; c < roi.width; c++) out[r * roi.width + c] += (page[from + c] as number) / other.pages.length;
    }
  }
  return out;
}
