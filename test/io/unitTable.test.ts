import { unit as mathUnit } from "mathjs";
import { describe, expect, it } from "vitest";
import { isIntensityUnit, lookupUnitExpression, positionUnitFactor, unitFactor } from "../../src/advanced.js";

// Reference: mathjs 15 (its unit definitions follow SI and the 1959 international yard), run here
// beside fringekit's own tables, which replaced it at run time for start-up speed.
describe("unitFactor(text, kind) agrees with mathjs", () => {
  const lengths = ["m", "mm", "um", "µm", "nm", "pm", "cm", "dm", "km", "in", "inch", "ft", "yd", "mi", "mil", "angstrom", "meter", "millimeter", "micrometer", "nanometer", "kilometers"];
  it.each(lengths)("unitFactor(%j, 'length') equals mathjs's factor to m", (u) => {
    const reference = mathUnit(1, u.replace("µ", "u")).toNumber("m");
    expect(unitFactor(u, "length")! / reference).toBeCloseTo(1, 14);
    // British spellings (metre) read the same as the American ones mathjs knows.
    if (u.endsWith("meter")) expect(unitFactor(u.replace(/meter$/, "metre"), "length")).toBe(unitFactor(u, "length"));
  });
  const angles = ["rad", "mrad", "urad", "deg", "degree", "degrees", "arcmin", "arcsec", "grad", "cycle", "milliradian"];
  it.each(angles)("unitFactor(%j, 'angle') equals mathjs's factor to rad", (u) => {
    const reference = mathUnit(1, u.replace(/^degrees?$/, "deg")).toNumber("rad");
    expect(unitFactor(u, "angle")! / reference).toBeCloseTo(1, 14);
  });
  it("unitFactor refuses other kinds and unknown words, as mathjs's dimension check did", () => {
    for (const [u, kind] of [["kg", "length"], ["s", "length"], ["mm", "angle"], ["deg", "length"], ["furlongs", "length"], ["Mm", "angle"], ["mm^2", "length"]] as const) {
      expect(unitFactor(u, kind)).toBeUndefined();
    }
    expect(unitFactor("", "dimensionless")).toBe(1);
    expect(positionUnitFactor("micron")).toBeCloseTo(1e-6, 20);
  });
  it("lookupUnitExpression('mW/cm^2') is irradiance with mathjs's factor", () => {
    const got = lookupUnitExpression("mW/cm^2")!;
    expect(got.dimension).toBe("irradiance");
    expect(got.factor / mathUnit(1, "mW/cm^2").toNumber("W/m^2")).toBeCloseTo(1, 14);
    expect(isIntensityUnit("uW/mm2")).toBe(true);
    expect(isIntensityUnit("kV")).toBe(true);
    expect(isIntensityUnit("nA")).toBe(true);
    expect(isIntensityUnit("s")).toBe(false);
  });
});
