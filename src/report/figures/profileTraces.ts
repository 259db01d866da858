/**
 * The measured points of a profile as plotly traces: used points in ink, excluded ones
 * (mask = 0) as light crosses, so a reader sees what the fit left out. Shared by the fit and
 * comparison figures, with the axis scaling both use.
 */
import type { Profile } from "../../profile.js";
import { intensityAxis, lengthAxis } from "./axes.js";
import { plainArray, plotlyText } from "./figureSpec.js";
import { DATA_DENSE, EXCLUDED, INK } from "./palette.js";

/** Point traces of a profile with the axis scalings they use. */
export interface ProfileTraces {
  traces: Record<string, unknown>[];
  /** Position axis: scale from m and title (e.g. mm). */
  xAxis: { scale: number; title: string; unit: string };
  /** Intensity axis: scale (e.g. 10⁻³) and title. */
  yAxis: { scale: number; title: string };
  /** Marker size in px: smaller for dense profiles. */
  markerPx: number;
}

/** Traces of the profile's points on axes x/y; error bars from σ when there are at most 200 points. */
export function profileTraces(profile: Profile, dataLabel = "data"): ProfileTraces {
  const xAxis = lengthAxis(profile.x, "Position", "x");
  const yAxis = intensityAxis(profile.y, profile.yUnit);
  const used: number[] = [];
  const excluded: number[] = [];
  for (let i = 0; i < profile.x.length; i++) (profile.mask && profile.mask[i] === 0 ? excluded : used).push(i);
  const pick = (values: ArrayLike<number>, idx: number[], scale: number) => plainArray(idx.map((i) => values[i]), scale);
  const markerPx = profile.x.length > 500 ? 2 : 3.5;
  const traces: Record<string, unknown>[] = [
    {
      type: "scatter", mode: "markers", name: plotlyText(dataLabel),
      x: pick(profile.x, used, xAxis.scale), y: pick(profile.y, used, yAxis.scale),
      marker: { color: used.length > 200 ? DATA_DENSE : INK, size: markerPx, line: { width: 0 } },
      ...(profile.sigma && used.length <= 200
        ? { error_y: { type: "data", array: pick(profile.sigma, used, yAxis.scale), color: INK, thickness: 0.6, width: 0 } }
        : {}),
      xaxis: "x", yaxis: "y",
    },
  ];
  if (excluded.length) {
    traces.push({
      type: "scatter", mode: "markers", name: "excluded",
      x: pick(profile.x, excluded, xAxis.scale), y: pick(profile.y, excluded, yAxis.scale),
      marker: { color: EXCLUDED, size: markerPx + 1.5, symbol: "x-thin-open", line: { width: 0.8, color: EXCLUDED } },
      xaxis: "x", yaxis: "y",
    });
  }
  return { traces, xAxis, yAxis, markerPx };
}
