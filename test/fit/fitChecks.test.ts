// Fit checks on profiles simulated outside fringekit (NumPy via Debian python3-numpy, with the
// intensity formulas written out below): saturated table, no fringe, poor fit, aliasing,
// forgotten geometry and implausible units. Tests skip visibly when NumPy/SciPy are missing.
import { describe, expect, it } from "vitest";
import { InvalidArgumentError } from "../../src/errors.js";
import { fitProfile } from "../../src/fit/fitProfile.js";
import { getModel } from "../../src/physics/index.js";
import type { Profile } from "../../src/profile.js";
import { parseTable } from "../../src/io/parseTable.js";
import { python, scipyMissing } from "../stats/python.js";

const maybe = scipyMissing ? it.skip : it;

/** Far-field two-slit intensity, small angle, written out (Born & Wolf §7.3.3 / common practice). */
const TWO_SLIT_PY = `
import numpy as np
def two_slit(x, A, B, d, a, V, lam, L, phi=0.0):
    s = x / np.sqrt(x * x + L * L)
    beta = np.pi * a * s / lam
    return B + A * np.sinc(beta / np.pi) ** 2 * (1 + V * np.cos(2 * np.pi * d * s / lam + phi))
`;

/** Far-field N-slit intensity, written out (Born & Wolf §8.6.1): sinc² envelope × grating factor. */
const N_SLIT_PY = `
import numpy as np
def n_slit(x, A, B, d, a, N, lam, L):
    s = x / np.sqrt(x * x + L * L)
    phi = np.pi * d * s / lam
    with np.errstate(invalid="ignore", divide="ignore"):
        grating = np.where(np.abs(np.sin(phi)) < 1e-12, 1.0, (np.sin(N * phi) / (N * np.sin(phi))) ** 2)
    return B + A * np.sinc(a * s / lam) ** 2 * grating
`;

interface Simulated { x: number[]; y: number[] }

function profileOf(sim: Simulated): Profile {
  return { x: Float64Array.from(sim.x), y: Float64Array.from(sim.y), yUnit: "counts", counts: true };
}

const GEOMETRY = { wavelength: "632.8 nm", distance: "1 m" };

describe("fitProfile(profile, model, options) checks", () => {
  maybe("parseTable(12-bit camera line with 1153 samples at the top code 4095) masks them: visibility 0.80 recovered", () => {
    // Amplitude 15249 counts was found (a search over whole counts with this seed) as the first
    // that clips 1153 samples at 4095; the simulation prints how many it actually clipped.
    const sim = python<Simulated & { clipped: number }>(TWO_SLIT_PY + `
x = (np.arange(4096) - 2048) * 5.5e-6
def line(A):
    rng = np.random.default_rng(12)
    return np.minimum(rng.poisson(two_slit(x, A, 100.0, 0.5e-3, 0.1e-3, 0.80, 632.8e-9, 1.0)), 4095)
y = line(15249.0)
print(json.dumps({"x": x.tolist(), "y": y.tolist(), "clipped": int((y == 4095).sum())}))
`, {});
    expect(sim.clipped).toBe(1153);
    const text = "position [mm],intensity (counts)\n" + sim.x.map((x, i) => `${(x * 1e3).toFixed(4)},${sim.y[i]}`).join("\n");
    const masked = parseTable(text, { source: "clipped.csv" });
    const fit = fitProfile(masked.profile, getModel("two-slit"), { fix: GEOMETRY });
    const warning = fit.warnings.find((w) => w.code === "saturated-masked");
    expect(warning?.message).toMatch(new RegExp(`^${sim.clipped} saturated samples \\(at the detector top code 4095\\) masked at x = `));
    // Truths of the simulation above, each within 4 standard uncertainties: the automatic starts
    // find the fringe although 1153 samples around the peaks are missing, and the checks do not
    // mistake the holes for an absent fringe.
    const value = (name: string) => fit.parameters.find((p) => p.name === name)!;
    for (const [name, truth] of [["visibility", 0.8], ["separation", 0.5e-3], ["width", 0.1e-3], ["background", 100]] as const) {
      expect(Math.abs(value(name).value - truth), name).toBeLessThan(4 * value(name).uncertainty);
    }
    expect(fit.warnings.map((w) => w.code)).toEqual(["saturated-masked"]);
    expect(fit.goodness.verdict).not.toBe("poor");
    const kept = parseTable(text, { source: "clipped.csv", maskSaturated: false });
    const biased = fitProfile(kept.profile, getModel("two-slit"), { fix: GEOMETRY });
    expect(biased.warnings.map((w) => w.code)).toContain("saturated-kept");
    // Clipped peaks lower the fitted contrast, and the χ² test notices the misfit.
    expect(biased.parameters.find((p) => p.name === "visibility")!.value).toBeLessThan(0.75);
    expect(biased.goodness.verdict).toBe("poor");
  }, 60_000);

  maybe("fitProfile(five saturated 12-bit lines, masked) finds every truth without false warnings; a saturated beam without fringes is flagged", () => {
    // Geometries, visibilities, phases and clip fractions spread over what a camera line meets
    // (4 % to 19 % of the samples at the top code); each line's truth is the simulation's input.
    const sim = python<{ lines: (Simulated & { clipped: number; truth: Record<string, number> })[]; beam: Simulated & { clipped: number } }>(TWO_SLIT_PY + `
x = (np.arange(4096) - 2048) * 5.5e-6
cases = [(0.3e-3, 80e-6, 0.5, 6000, 0.3), (0.8e-3, 150e-6, 0.9, 9000, -1.0), (0.5e-3, 60e-6, 0.7, 4000, 2.0),
         (0.25e-3, 120e-6, 0.6, 20000, 0.0), (0.6e-3, 100e-6, 0.95, 3000, 1.2)]
lines = []
for k, (d, a, V, A, phi) in enumerate(cases):
    y = np.minimum(np.random.default_rng(100 + k).poisson(two_slit(x, A, 80.0, d, a, V, 532e-9, 0.8, phi)), 4095)
    lines.append({"x": x.tolist(), "y": y.tolist(), "clipped": int((y == 4095).sum()), "truth": {"separation": d, "width": a, "visibility": V}})
beam = np.minimum(np.random.default_rng(7).poisson(30.0 + 6000.0 * np.exp(-2 * (x / 4e-3) ** 2)), 4095)
print(json.dumps({"lines": lines, "beam": {"x": x.tolist(), "y": beam.tolist(), "clipped": int((beam == 4095).sum())}}))
`, {});
    const table = (line: Simulated) => "position [mm],intensity (counts)\n" + line.x.map((x, i) => `${(x * 1e3).toFixed(4)},${line.y[i]}`).join("\n");
    const geometry = { wavelength: "532 nm", distance: "0.8 m" };
    for (const [k, line] of sim.lines.entries()) {
      expect(line.clipped, `line ${k}`).toBeGreaterThan(100);
      const fit = fitProfile(parseTable(table(line), { source: `line${k}.csv` }).profile, getModel("two-slit"), { fix: geometry });
      for (const [name, truth] of Object.entries(line.truth)) {
        const p = fit.parameters.find((q) => q.name === name)!;
        expect(Math.abs(p.value - truth), `line ${k} ${name}`).toBeLessThan(4 * p.uncertainty);
      }
      expect(fit.warnings.map((w) => w.code), `line ${k}`).toEqual(["saturated-masked"]);
    }
    // A Gaussian beam clipped at the top code has no fringe: the gaps must not create one.
    expect(sim.beam.clipped).toBeGreaterThan(100);
    const beam = fitProfile(parseTable(table(sim.beam), { source: "beam.csv" }).profile, getModel("two-slit"), { fix: geometry });
    expect(beam.warnings.map((w) => w.code)).toContain("no-fringes");
  }, 60_000);

  maybe("fitProfile(saturated three-slit line, masked, n-slit) finds separation and width and sees the fringe", () => {
    const sim = python<Simulated & { clipped: number }>(N_SLIT_PY + `
x = (np.arange(4096) - 2048) * 5.5e-6
y = np.minimum(np.random.default_rng(31).poisson(n_slit(x, 8000.0, 60.0, 0.4e-3, 0.09e-3, 3, 632.8e-9, 1.0)), 4095)   # 12-bit
print(json.dumps({"x": x.tolist(), "y": y.tolist(), "clipped": int((y == 4095).sum())}))
`, {});
    expect(sim.clipped).toBeGreaterThan(100);
    const text = "position [mm],intensity (counts)\n" + sim.x.map((x, i) => `${(x * 1e3).toFixed(4)},${sim.y[i]}`).join("\n");
    const fit = fitProfile(parseTable(text, { source: "three.csv" }).profile, getModel("n-slit"), { fix: { ...GEOMETRY, slits: 3 } });
    for (const [name, truth] of [["separation", 0.4e-3], ["width", 0.09e-3]] as const) {
      const p = fit.parameters.find((q) => q.name === name)!;
      expect(Math.abs(p.value - truth), name).toBeLessThan(4 * p.uncertainty);
    }
    expect(fit.warnings.map((w) => w.code)).toEqual(["saturated-masked"]);
    expect(fit.goodness.fringes!.significant).toBe(true);
  }, 60_000);

  maybe("fitProfile(Gaussian beam without fringes, two-slit) warns no-fringes; a 0.8-visibility line does not", () => {
    const sim = python<{ none: Simulated; fringes: Simulated }>(TWO_SLIT_PY + `
x = (np.arange(2048) - 1024) * 5.5e-6
rng = np.random.default_rng(5)
beam = 30.0 + 1500.0 * np.exp(-2 * (x / 2.5e-3) ** 2)   # 1/e^2 radius 2.5 mm, no interference
lines = two_slit(x, 1500.0, 30.0, 0.5e-3, 0.1e-3, 0.80, 632.8e-9, 1.0, 0.4)
print(json.dumps({"none": {"x": x.tolist(), "y": rng.poisson(beam).tolist()},
                  "fringes": {"x": x.tolist(), "y": rng.poisson(lines).tolist()}}))
`, {});
    const none = fitProfile(profileOf(sim.none), getModel("two-slit"), { fix: GEOMETRY });
    const warning = none.warnings.find((w) => w.code === "no-fringes");
    expect(warning?.message).toMatch(/^no significant fringe in these data at the fitted period: .* false-alarm probability [\d.e+-]+ \(a fringe needs < 0\.001\); separation, visibility and phase are not meaningful/);
    expect(none.goodness.fringes!.significant).toBe(false);
    const fringes = fitProfile(profileOf(sim.fringes), getModel("two-slit"), { fix: GEOMETRY });
    expect(fringes.warnings.map((w) => w.code)).not.toContain("no-fringes");
    expect(fringes.goodness.fringes!.significant).toBe(true);
    // Period λL/d = 1.2656 mm = 230.1 samples of 5.5 µm (hand computation from the simulation's values).
    expect(fringes.goodness.fringes!.fittedPeriodSamples).toBeCloseTo(230.1, 0);
  }, 60_000);

  maybe("fitProfile(three-slit data, two-slit) is a poor fit: 'the model does not describe these data'; p-value as SciPy's chi2.sf", () => {
    const sim = python<Simulated>(N_SLIT_PY + `
x = (np.arange(2048) - 1024) * 5.5e-6
y = n_slit(x, 3000.0, 40.0, 0.5e-3, 0.1e-3, 3, 632.8e-9, 1.0)
print(json.dumps({"x": x.tolist(), "y": np.random.default_rng(8).poisson(y).tolist()}))
`, {});
    const fit = fitProfile(profileOf(sim), getModel("two-slit"), { fix: GEOMETRY });
    expect(fit.converged).toBe(true);
    expect(fit.goodness.verdict).toBe("poor");
    const warning = fit.warnings.find((w) => w.code === "poor-fit")!;
    expect(warning.message).toMatch(/^the model does not describe these data \(χ²\/ν = [\d.e+]+ for ν = \d+, p [<=] [\d.e+-]+; expected 1 ± 0\.031/);
    // The same data with the right model: consistent with the noise, p-value as SciPy's.
    const right = fitProfile(profileOf(sim), getModel("n-slit"), { fix: { ...GEOMETRY, slits: 3 } });
    expect(right.goodness.verdict).toBe("good");
    const reference = python<number>("from scipy.stats import chi2\nprint(json.dumps(float(chi2.sf(data[0], data[1]))))", [right.goodness.chi2, right.goodness.dof]);
    expect(right.goodness.pValue).toBeCloseTo(reference, 8);
  }, 60_000);

  maybe("fitProfile(..., { fix: { separation } }) with a fringe period below two samples warns fringe-aliased", () => {
    const sim = python<Simulated>(TWO_SLIT_PY + `
x = (np.arange(1024) - 512) * 5.5e-6
y = np.random.default_rng(3).poisson(two_slit(x, 800.0, 20.0, 0.5e-3, 0.1e-3, 0.6, 632.8e-9, 1.0))
print(json.dumps({"x": x.tolist(), "y": y.tolist()}))
`, {});
    // λL/d = 632.8e-9 m / 0.09 m^-1... d = 80 mm gives 7.9 µm = 1.44 samples of 5.5 µm (hand computation).
    const fit = fitProfile(profileOf(sim), getModel("two-slit"), { fix: { ...GEOMETRY, separation: "80 mm" } });
    const warning = fit.warnings.find((w) => w.code === "fringe-aliased");
    expect(warning?.message).toMatch(/^the fitted fringe period λL\/d = 7\.9\d* µm is 1\.44 sample spacings, below the 2 the sampling can show \(Nyquist\)/);
  }, 60_000);

  maybe("fitProfile(three-slit data, n-slit) without slits, wavelength, distance warns default-geometry for each", () => {
    const sim = python<Simulated>(TWO_SLIT_PY + `
x = (np.arange(1024) - 512) * 5.5e-6
y = np.random.default_rng(4).poisson(two_slit(x, 800.0, 20.0, 0.5e-3, 0.1e-3, 0.9, 632.8e-9, 1.0))
print(json.dumps({"x": x.tolist(), "y": y.tolist()}))
`, {});
    const forgotten = fitProfile(profileOf(sim), getModel("n-slit"));
    const named = forgotten.warnings.filter((w) => w.code === "default-geometry");
    expect(named.map((w) => w.parameter).sort()).toEqual(["distance", "slits", "wavelength"]);
    expect(named.find((w) => w.parameter === "slits")!.message).toMatch(/^slits not given: the model default 2 was used and the fitted values depend on it; give the real value \(fix: \{ slits: 2 \}/);
    const given = fitProfile(profileOf(sim), getModel("n-slit"), { fix: { ...GEOMETRY, slits: 2 } });
    expect(given.warnings.map((w) => w.code)).not.toContain("default-geometry");
  }, 60_000);
});

describe("fitProfile(profile, model, { fix: implausible lengths }) refuses and names the unit", () => {
  const profile: Profile = {
    x: Float64Array.from({ length: 64 }, (_, i) => i * 5.5e-6),
    y: Float64Array.from({ length: 64 }, (_, i) => 100 + 50 * Math.cos(i)),
    yUnit: "counts", counts: true,
  };
  const refuse = (fix: Record<string, number | string>, message: RegExp): void => {
    let error: unknown;
    try { fitProfile(profile, getModel("two-slit"), { fix }); } catch (e) { error = e; }
    expect(error).toBeInstanceOf(InvalidArgumentError);
    expect((error as Error).message).toMatch(message);
  };
  // Plausible ranges are common practice for optical benches (see src/units/plausibility.ts).
  it("wavelength 532 (metres) → 'looks like nanometres: write \"532 nm\"'", () => {
    refuse({ wavelength: 532 }, /^invalid fix\.wavelength: 532 \(532 m is not a plausible wavelength .*; 532 looks like nanometres: write "532 nm"\)$/);
  });
  it("distance 1000 (1 km between slits and camera) → millimetres", () => {
    refuse({ wavelength: "633 nm", distance: 1000 }, /1000 looks like millimetres: write "1000 mm"/);
  });
  it("pixelWidth 3.45 (metres) → micrometres; the text '3.45 m' is refused the same way", () => {
    refuse({ pixelWidth: 3.45 }, /3\.45 looks like micrometres: write "3\.45 um"/);
    refuse({ pixelWidth: "3.45 m" }, /3\.45 looks like micrometres/);
  });
  it("parseTable(pixel column, { pixelPitch: 3.45 }) refuses the pitch", () => {
    expect(() => parseTable("px,counts\n0,1\n1,2\n2,3\n", { pixelPitch: 3.45 })).toThrow(/invalid pixelPitch: 3\.45 \(3\.45 m is not a plausible pixel pitch .*write "3\.45 um"\)/);
  });
  it("start/fix/bounds accept text with units and give the same fit as SI numbers", () => {
    const a = fitProfile(profile, getModel("two-slit"), { fix: { wavelength: "632.8 nm", distance: "1 m" }, start: { separation: "0.5 mm" }, bounds: { separation: ["0.1 mm", "2 mm"] } });
    const b = fitProfile(profile, getModel("two-slit"), { fix: { wavelength: 632.8e-9, distance: 1 }, start: { separation: 0.5e-3 }, bounds: { separation: [0.1e-3, 2e-3] } });
    expect(a.parameters.map((p) => p.value)).toEqual(b.parameters.map((p) => p.value));
    expect(() => fitProfile(profile, getModel("two-slit"), { fix: { wavelength: "532 kg" } })).toThrow(/invalid fix\.wavelength: "532 kg" \(the unit "kg" is not a length unit/);
  });
});
