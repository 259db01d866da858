// Pure helpers behind the explorer's live preview and its number formatting.
import { describe, expect, it } from "vitest";
import { getModel, pixelPositions, simulateProfile } from "../../src/physics/index.js";
import { fitProfileResult, residualScale, type Profile } from "../../src/advanced.js";
import { fitFigure } from "../../src/report/figures/fitFigure.js";
import { displayUnitFor, formatWithUncertainty } from "../../widgets/src/displayUnits.js";
import { effectiveMask, paramsForModel, paramVector, residuals, sliderRange } from "../../widgets/shared/preview.js";

describe("preview", () => {
  it("effectiveMask(x, mask, window, ranges) keeps points inside the window, outside ranges, with mask 1", () => {
    const x = Float64Array.from([0, 1, 2, 3, 4, 5, 6]);
    const mask = Uint8Array.from([1, 1, 1, 0, 1, 1, 1]);
    expect(Array.from(effectiveMask(x, mask, [1, 5], [[4.5, 3.5]]))).toEqual([0, 1, 1, 0, 0, 1, 0]);
    expect(Array.from(effectiveMask(x, null, null, []))).toEqual([1, 1, 1, 1, 1, 1, 1]);
  });

  it('residuals(y, f, null, "sqrt-model", used) are Pearson residuals (y − f)/√f, NaN where unused', () => {
    const out = residuals(Float64Array.from([110, 90, 5]), Float64Array.from([100, 100, 4]), null, "sqrt-model", Uint8Array.from([1, 1, 0]), new Float64Array(3));
    expect(out[0]).toBeCloseTo(1, 12); // (110 − 100)/√100, common practice (Pearson residual)
    expect(out[1]).toBeCloseTo(-1, 12);
    expect(out[2]).toBeNaN();
  });

  it("paramsForModel(model, previous) keeps known values and fills the rest from the specs", () => {
    const model = getModel("two-slit");
    const params = paramsForModel(model, { separation: { value: 0.3e-3, fixed: false, lower: 0, upper: 1 } });
    expect(params.separation!.value).toBe(0.3e-3);
    const wavelength = model.parameters.find((p) => p.name === "wavelength")!;
    expect(params.wavelength).toEqual({ value: wavelength.default, fixed: true, lower: wavelength.lower, upper: wavelength.upper });
    const vector = paramVector(model, params, new Float64Array(model.parameters.length));
    expect(vector[model.parameters.indexOf(wavelength)]).toBe(wavelength.default);
  });

  it("sliderRange(value, lower, upper, zeroSpan) spans value ± |value| inside the bounds", () => {
    expect(sliderRange(0.5e-3, 0, Infinity)).toEqual([0, 1e-3]);
    expect(sliderRange(0.7, 0, 1)).toEqual([0.7 - 0.7, 1]);
    expect(sliderRange(0, -Infinity, Infinity, Math.PI)).toEqual([-Math.PI, Math.PI]);
  });

  it("displayUnitFor(unit, typical) shows lengths in nm, µm, mm or m", () => {
    expect(displayUnitFor("m", 632.8e-9).label).toBe("nm");
    expect(displayUnitFor("m", 0.1e-3).label).toBe("µm");
    expect(displayUnitFor("m", 0.5e-3).label).toBe("µm");
    expect(displayUnitFor("m", 3e-3).label).toBe("mm");
    expect(displayUnitFor("m", 1).label).toBe("m");
    expect(displayUnitFor("counts", 1e4)).toEqual({ label: "counts", factor: 1 });
  });

  it("formatWithUncertainty(value, uncertainty) rounds the uncertainty to two significant digits", () => {
    // Two significant digits on the uncertainty, value to the same decimal: common practice (GUM 7.2.6).
    expect(formatWithUncertainty(500.3149, 0.8712)).toBe("500.31 ± 0.87");
    expect(formatWithUncertainty(0.84973, 0.0021)).toBe("0.8497 ± 0.0021");
    expect(formatWithUncertainty(20011.4, 137.2)).toBe("20010 ± 140");
    expect(formatWithUncertainty(1.5, Infinity)).toBe("1.5 ± ∞");
  });
});

describe("residuals(y, f, σ, residualScale(noise, hasSigma, counts), used) match the fitter's residuals", () => {
  const model = getModel("two-slit");
  const truth = { amplitude: 800, background: 40, center: 0, separation: 0.5e-3, width: 0.1e-3, visibility: 0.8, phase: 0.1 };
  const x = pixelPositions(300, 22e-6, -3.3e-3);
  const counts = simulateProfile(model, truth, x, { noise: "poisson", seed: 4 });
  const sigma = new Float64Array(x.length).fill(25);
  const cases: [string, Profile, "gaussian" | "poisson" | "robust"][] = [
    ["counts, poisson", counts, "poisson"],
    ["counts, gaussian (σ = √y, as the fitter takes it)", counts, "gaussian"],
    ["counts with σ, poisson (√f)", { ...counts, sigma }, "poisson"],
    ["σ given, gaussian", { ...counts, counts: false, sigma }, "gaussian"],
    ["nothing known, gaussian (plain y − f)", { ...counts, counts: false }, "gaussian"],
  ];
  for (const [name, profile, noise] of cases) {
    it(name, () => {
      const fit = fitProfileResult(profile, model, { start: truth, noise });
      const used = new Uint8Array(x.length).fill(1);
      const scale = residualScale(noise, profile.sigma !== undefined, profile.counts);
      const preview = residuals(profile.y, fit.model, profile.sigma ?? null, scale, used, new Float64Array(x.length));
      for (let i = 0; i < x.length; i += 37) expect(preview[i]).toBeCloseTo(fit.residuals[i], 10);
    });
  }

  it("fitFigure labels the residual axis by what the residuals are divided by", () => {
    const title = (profile: Profile, noise: "gaussian" | "poisson") =>
      ((fitFigure(profile, fitProfileResult(profile, model, { start: truth, noise })).layout.yaxis2 as { title: { text: string } }).title.text);
    expect(title(counts, "poisson")).toBe("(<i>I</i>−<i>f</i>)/√<i>f</i>");
    expect(title(counts, "gaussian")).toBe("(<i>I</i>−<i>f</i>)/√<i>I</i>");
    expect(title({ ...counts, counts: false, sigma }, "gaussian")).toBe("(<i>I</i>−<i>f</i>)/<i>σ</i>");
    expect(title({ ...counts, counts: false }, "gaussian")).toBe("<i>I</i>−<i>f</i>");
  });
});
