import { describe, expect, it } from "vitest";
import { InvalidArgumentError, isIntensityUnit, parseColumnHeader, parseQuantity, positionUnitFactor } from "../../src/advanced.js";

// Unit factors are SI prefix definitions (BIPM, The International System of Units, 9th ed., Table 7).
describe("parseQuantity(text, kind)", () => {
  it.each([
    ["532nm", 532e-9], ["532 nm", 532e-9], ["0.85m", 0.85], ["1 mm", 1e-3], ["5.5 um", 5.5e-6],
    ["5.5 µm", 5.5e-6], ["5.5μm", 5.5e-6], ["-2.5mm", -2.5e-3], ["1e-3 m", 1e-3], ["3 cm", 0.03],
  ])("parseQuantity(%j, 'length') = %d m", (text, expected) => {
    expect(parseQuantity(text, "length").value).toBeCloseTo(expected, 18);
  });

  it("parseQuantity('2 mrad', 'angle') and ('1 deg', 'angle') give radians", () => {
    expect(parseQuantity("2 mrad", "angle").value).toBeCloseTo(0.002, 15);
    expect(parseQuantity("1 deg", "angle").value).toBeCloseTo(Math.PI / 180, 15); // 1° = π/180 rad (definition)
  });

  it("parseQuantity('3', 'length', arg, 'mm') takes a bare number in the default unit", () => {
    expect(parseQuantity("3", "length", "x", "mm").value).toBeCloseTo(3e-3, 15);
  });

  it("parseQuantity('1 kg', 'length') is a clear error naming the argument", () => {
    expect(() => parseQuantity("1 kg", "length", "--set wavelength")).toThrow(InvalidArgumentError);
    expect(() => parseQuantity("1 kg", "length", "--set wavelength")).toThrow(/invalid --set wavelength: "1 kg" \(the unit "kg" is not a length unit/);
    expect(() => parseQuantity("abc", "length", "--pixel-pitch")).toThrow(/invalid --pixel-pitch: "abc"/);
  });
});

describe("parseColumnHeader(text)", () => {
  it.each([
    ["position [mm]", "position", "mm"], ["intensity (counts)", "intensity", "counts"], ["x / um", "x", "um"],
    ["Sigma", "sigma", ""], ["I [a.u.]", "i", "a.u."],
  ])("parseColumnHeader(%j) = {name: %j, unit: %j}", (raw, name, unit) => {
    const header = parseColumnHeader(raw);
    expect([header.name, header.unit]).toEqual([name, unit]);
  });

  it("positionUnitFactor and isIntensityUnit accept what fits the column and refuse the rest", () => {
    expect(positionUnitFactor("mm")).toBeCloseTo(1e-3, 18);
    expect(positionUnitFactor("kg")).toBeUndefined();
    expect(isIntensityUnit("counts")).toBe(true);
    expect(isIntensityUnit("mW")).toBe(true);
    expect(isIntensityUnit("kg")).toBe(false);
    expect(isIntensityUnit("mm")).toBe(false);
  });
});
