import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTable, readTable, sha256Hex } from "../../src/advanced.js";

const corpus = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`./corpus/${name}`, import.meta.url)));

// Expected numbers are the cells of the corpus files (written by corpus/make_corpus.py) or of the
// inline tables, converted to metres with the SI prefixes (BIPM SI Brochure, 9th ed., Table 7).
describe("parseTable(text, options)", () => {
  it("readTable(good.csv) converts mm to m, finds σ, detects counts and hashes the bytes", () => {
    const bytes = corpus("good.csv");
    const { profile } = readTable(bytes, { source: "good.csv" });
    expect(profile.x.length).toBe(201);
    expect(profile.x[0]).toBeCloseTo(-1e-3, 15); // 1 mm = 1e-3 m (SI prefix, common practice)
    expect(profile.x[200]).toBeCloseTo(1e-3, 15);
    expect(profile.y[5]).toBe(105);
    expect(profile.sigma?.[1]).toBe(11);
    expect(profile.counts).toBe(true);
    expect(profile.yUnit).toBe("counts");
    expect(profile.provenance?.sha256).toBe(sha256Hex(bytes));
    expect(profile.provenance?.source).toBe("good.csv");
  });

  it("parseTable(semicolon file with decimal commas) reads 0,5 as 0.5", () => {
    const { profile } = readTable(corpus("good-semicolon.csv"), { source: "s.csv" });
    expect(profile.x[0]).toBeCloseTo(0.5e-6, 18);
    expect(profile.x[1]).toBeCloseTo(5.5e-6, 18);
    expect(profile.y[1]).toBeCloseTo(1.1, 12);
    expect(profile.counts).toBe(false);
  });

  it("parseTable(TSV and whitespace, comments, no header) with xUnit", () => {
    const tsv = parseTable("# scan\nx [um]\ty\n1\t5\n2\t6\n3\t7\n", { source: "t.tsv" }).profile;
    expect(Array.from(tsv.x)).toEqual([1e-6, 2e-6, 3e-6]);
    const ws = parseTable("% no header\n  0.1   5\n  0.2   6\n  0.3   7\n", { source: "w.txt", xUnit: "mm" }).profile;
    expect(ws.x[2]).toBeCloseTo(3e-4, 15);
    expect(() => parseTable("0.1 5\n0.2 6\n0.3 7\n", { source: "w.txt" })).toThrow(/w\.txt: the position column "column 1" has no unit; write it in the header/);
  });

  it("parseTable(space-separated header with bracketed units) keeps each unit with its column", () => {
    const { profile } = parseTable("position [mm]   intensity (counts)\n0.1 5\n0.2 6\n0.3 7\n", { source: "s.txt" });
    expect(profile.x[1]).toBeCloseTo(2e-4, 15);
    expect(profile.yUnit).toBe("counts");
  });

  it("parseTable uses a header given as the last comment line", () => {
    const { profile } = parseTable("# position [mm], counts\n0.1, 5\n0.2, 6\n0.3, 7\n", { source: "c.csv" });
    expect(profile.x[0]).toBeCloseTo(1e-4, 15);
  });

  it("parseTable(pixel column, pixelPitch) multiplies indices by the pitch", () => {
    const { profile } = readTable(corpus("pixels-no-pitch.csv"), { source: "p.csv", pixelPitch: 5.5e-6 });
    expect(profile.x[3]).toBeCloseTo(3 * 5.5e-6, 18);
  });

  it("parseTable chooses columns by name or number and finds <y>_sigma", () => {
    const text = "pos [mm],ref,signal,signal_sigma\n0,9,1,0.1\n1,9,2,0.2\n2,9,3,0.3\n";
    const auto = parseTable(text, { source: "a.csv" }).profile;
    expect(Array.from(auto.y)).toEqual([1, 2, 3]);
    expect(Array.from(auto.sigma!)).toEqual([0.1, 0.2, 0.3]);
    const chosen = parseTable(text, { source: "a.csv", y: 2, sigma: false }).profile;
    expect(Array.from(chosen.y)).toEqual([9, 9, 9]);
    expect(chosen.sigma).toBeUndefined();
    expect(() => parseTable(text, { source: "a.csv", y: "nothing" })).toThrow(/a\.csv: no column named "nothing" for y; the columns are "pos", "ref", "signal", "signal_sigma"/);
  });

  it("parseTable reverses a decreasing scan and notes it", () => {
    const { profile } = parseTable("x [mm],y\n3,1\n2,2\n1,3\n", { source: "d.csv" });
    expect(Array.from(profile.y)).toEqual([3, 2, 1]);
    expect(profile.provenance?.notes.join(" ")).toMatch(/reversed/);
  });

  it("parseTable(text) masks samples at a top code by default; maskSaturated: false keeps them", () => {
    // 4095 = 2^12 − 1, the top code of a 12-bit detector (common practice); positions hand-counted.
    const text = "x [mm],counts\n" + [10, 200, 4095, 4095, 4095, 300, 20].map((v, i) => `${i},${v}`).join("\n");
    const masked = parseTable(text, { source: "s.csv" });
    expect(Array.from(masked.profile.mask!)).toEqual([1, 1, 0, 0, 0, 1, 1]);
    expect(masked.warnings[0]).toMatch(/^3 saturated samples \(at the detector top code 4095\) masked at x = 2–4 mm/);
    expect(masked.profile.warnings).toEqual([{ code: "saturated-masked", message: masked.warnings[0] }]);
    expect(masked.profile.provenance!.options["maskSaturated"]).toBe(true);
    const kept = parseTable(text, { source: "s.csv", maskSaturated: false });
    expect(Array.from(kept.profile.mask!)).toEqual([1, 1, 1, 1, 1, 1, 1]);
    expect(kept.warnings[0]).toMatch(/^3 samples sit at the detector top code 4095 \(saturated\) at x = 2–4 mm and were kept as asked/);
    expect(kept.profile.warnings![0]!.code).toBe("saturated-kept");
  });
});
