import { describe, expect, it } from "vitest";
import { DATA_DENSE, DIVERGING, EXCLUDED, INK, SERIES, SERIES_DASH, SERIES_MARKER } from "../../src/report/figures/palette.js";

/** CIE 1976 L* of an sRGB colour (sRGB transfer curve from IEC 61966-2-1; D65 luminance weights). */
function lightness(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);
  const linear = (c: number) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4);
  const y = 0.2126 * linear(r) + 0.7152 * linear(g) + 0.0722 * linear(b);
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

// L* gaps (10 between series, 40 for excluded points, ...) are design margins for greyscale
// print chosen here (common practice: about 10 L* is a step readers tell apart).
describe("palette", () => {
  it("lightness('#ffffff') is 100 and lightness('#000000') is 0 (CIE 1976 definition)", () => {
    expect(lightness("#ffffff")).toBeCloseTo(100, 6);
    expect(lightness("#000000")).toBeCloseTo(0, 6);
  });
  it("SERIES colours get lighter step by step, at least 10 L* apart (readable in greyscale)", () => {
    const l = SERIES.map(lightness);
    for (let i = 1; i < l.length; i++) expect(l[i] - l[i - 1]).toBeGreaterThanOrEqual(10);
    expect(l[0] - lightness(INK)).toBeGreaterThanOrEqual(5);
  });
  it("every series also differs by dash pattern and marker, so nothing rests on colour alone", () => {
    expect(new Set(SERIES_DASH).size).toBe(SERIES.length);
    expect(new Set(SERIES_MARKER).size).toBe(SERIES.length);
  });
  it("DIVERGING ends have equal lightness (within 3 L*) around a light middle", () => {
    const [lo, mid, hi] = DIVERGING.map(([, c]) => lightness(c));
    expect(Math.abs(lo - hi)).toBeLessThan(3);
    expect(mid).toBeGreaterThan(90);
  });
  it("EXCLUDED points are much lighter than data (L* difference > 40, > 15 for dense data)", () => {
    expect(lightness(EXCLUDED) - lightness(INK)).toBeGreaterThan(40);
    expect(lightness(EXCLUDED) - lightness(DATA_DENSE)).toBeGreaterThan(15);
  });
  it("dense data stay lighter than the first model curve drawn over them (L* difference > 20)", () => {
    expect(lightness(DATA_DENSE) - lightness(SERIES[0])).toBeGreaterThan(20);
  });
});
