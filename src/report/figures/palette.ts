/**
 * The fringekit figure palette. Colours differ in lightness as well as hue, so the curves stay
 * apart in greyscale print, and the hues (navy, vermilion, teal, ochre) avoid the red–green
 * pairs that colour-blind readers confuse; each series also gets its own dash pattern and
 * marker, so no information rests on colour alone.
 * CIE L* (from sRGB, IEC 61966-2-1): ink 18, navy 26, vermilion 48, dense-data grey 51,
 * teal 60, ochre 72, excluded grey 75; test/report/palette.test.ts checks the model steps
 * stay at least 10 apart.
 */

/** Data points and text. */
export const INK = "#2b2b2b";
/** Data points of dense profiles (> 200 points): grey, so the model curve drawn over them stays visible. */
export const DATA_DENSE = "#7a7a7a";
/** Points excluded from the fit (mask = 0): lighter still, and drawn as crosses. */
export const EXCLUDED = "#b8b8b8";
/** Model curves in order of use, dark to light. */
export const SERIES = ["#143d73", "#c0502e", "#3e9e97", "#d9a93b"] as const;
/** Dash pattern per series (plotly names), for greyscale and colour-blind readers. */
export const SERIES_DASH = ["solid", "dash", "dot", "dashdot"] as const;
/** Marker symbol per series (plotly names). */
export const SERIES_MARKER = ["circle", "square", "diamond", "triangle-up"] as const;
/** Fill of confidence bands: the first series colour, translucent. */
export const BAND_FILL = "rgba(20, 61, 115, 0.18)";
/** Reference lines (zero residual, Δχ² thresholds). */
export const GUIDE = "#7a7a7a";
/** Diverging scale for correlations: −1 navy, 0 near-white, +1 dark vermilion (equal lightness at ±1). */
export const DIVERGING: [number, string][] = [
  [0, "#143d73"],
  [0.5, "#f4f4f4"],
  [1, "#74280e"],
];

/** Colour, dash and marker of series `i` (0-based index; wraps around after four). */
export function seriesStyle(i: number): { color: string; dash: string; marker: string } {
  const k = ((i % SERIES.length) + SERIES.length) % SERIES.length;
  return { color: SERIES[k], dash: SERIES_DASH[k], marker: SERIES_MARKER[k] };
}
