import { execFileSync } from "node:child_process";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { createRandom } from "../../src/random.js";
import { InvalidArgumentError } from "../../src/errors.js";
import type { FitParameter } from "../../src/fit/types.js";
import { formatParameter, formatQuantity } from "../../src/report/formatQuantity.js";
import { roundPair, roundSignificant } from "../../src/report/rounding.js";
import { choosePrefix } from "../../src/report/siPrefix.js";

describe("roundPair(value, uncertainty, digits)", () => {
  it("roundPair(10.05762, 0.027) gives 10.058 ± 0.027 (JCGM 100:2008, 7.2.6 worked example, ohms)", () => {
    const pair = roundPair(10.05762, 0.027);
    expect(pair).toMatchObject({ value: "10.058", uncertainty: "0.027", lastDigit: -3, uncertaintyDigits: 27 });
  });
  it("roundPair(100.02147, 0.00035) gives 100.02147(35) (JCGM 100:2008, 7.2.2 example, grams)", () => {
    expect(roundPair(100.02147, 0.00035)).toMatchObject({ value: "100.02147", uncertaintyDigits: 35 });
  });
  it("roundPair(x, 28.05) keeps 28 (JCGM 100:2008, 7.2.6: 28.05 kHz is rounded to 28 kHz)", () => {
    expect(roundPair(1000.1234, 28.05)).toMatchObject({ value: "1000", uncertainty: "28" });
  });
  it("roundPair(x, 0.0996) carries into a new digit: 0.10 (hand-checked)", () => {
    expect(roundPair(1.23456, 0.0996)).toMatchObject({ value: "1.23", uncertainty: "0.10", lastDigit: -2 });
  });
  it("roundPair(20012.4, 1234) rounds to hundreds: 20000 ± 1200 (hand-checked)", () => {
    expect(roundPair(20012.4, 1234)).toMatchObject({ value: "20000", uncertainty: "1200", lastDigit: 2 });
  });
  it("roundPair(-0.0004, 0.012) prints 0.000, not -0.000 (hand-checked)", () => {
    expect(roundPair(-0.0004, 0.012).value).toBe("0.000");
  });
  it("roundPair(0.85, 0.0123, 1) rounds to one digit: 0.85 ± 0.01 (hand-checked)", () => {
    expect(roundPair(0.8512, 0.0123, 1)).toMatchObject({ value: "0.85", uncertainty: "0.01" });
  });
  it("roundPair rejects a zero, negative or infinite uncertainty with InvalidArgumentError", () => {
    expect(() => roundPair(1, 0)).toThrow(InvalidArgumentError);
    expect(() => roundPair(1, -1)).toThrow(/invalid uncertainty: -1/);
    expect(() => roundPair(1, Infinity)).toThrow(InvalidArgumentError);
    expect(() => roundPair(NaN, 1)).toThrow(/invalid value/);
  });
  it("roundSignificant(0.5, 3) keeps trailing zeros: 0.500 (hand-checked)", () => {
    expect(roundSignificant(0.5, 3)).toBe("0.500");
    expect(roundSignificant(123456, 2)).toBe("120000");
  });
});

describe("choosePrefix(magnitude)", () => {
  it("choosePrefix(6.328e-7) is n (632.8 nm, common practice for HeNe)", () => {
    expect(choosePrefix(6.328e-7).symbol).toBe("n");
  });
  it("choosePrefix(9.9996e-4) is m, because the number prints as 1.00 mm (hand-checked)", () => {
    expect(choosePrefix(9.9996e-4).symbol).toBe("m");
  });
  it("choosePrefix(0) and choosePrefix(1e-20) stay within p … G (hand-checked)", () => {
    expect(choosePrefix(0).symbol).toBe("");
    expect(choosePrefix(1e-20).symbol).toBe("p");
  });
});

describe("formatQuantity(value, uncertainty, unit, options)", () => {
  it("formatQuantity(6.328012e-7, 1.234e-10, 'm') is (632.80 ± 0.12) nm (hand-checked)", () => {
    const q = formatQuantity(6.328012e-7, 1.234e-10, "m");
    expect(q.text).toBe("(632.80 ± 0.12) nm");
    expect(q).toMatchObject({ value: "632.80", uncertainty: "0.12", unit: "nm", prefixExponent: -9 });
  });
  it("formatQuantity(5.0012e-4, 3.4e-7, 'm', {style: 'paren'}) is 500.12(34) µm (GUM 7.2.2 concise form)", () => {
    expect(formatQuantity(5.0012e-4, 3.4e-7, "m", { style: "paren" }).text).toBe("500.12(34) µm");
  });
  it("formatQuantity with prefix 'm' keeps millimetres: (0.50012 ± 0.00034) mm (hand-checked)", () => {
    expect(formatQuantity(5.0012e-4, 3.4e-7, "m", { prefix: "m" }).text).toBe("(0.50012 ± 0.00034) mm");
  });
  it("formatQuantity leaves rad, counts and dimensionless numbers unprefixed (common practice)", () => {
    expect(formatQuantity(0.30123, 0.0123, "rad").text).toBe("(0.301 ± 0.012) rad");
    expect(formatQuantity(20012.4, 34.2, "counts").text).toBe("(20012 ± 34) counts");
    expect(formatQuantity(0.85123, 0.00456, "1").text).toBe("0.8512 ± 0.0046");
  });
  it("formatQuantity writes a negative value with a typographic minus in text, ASCII in value", () => {
    const q = formatQuantity(-3.7e-4, 1.2e-6, "m");
    expect(q.text).toBe("(\u2212370.0 ± 1.2) µm");
    expect(q.value).toBe("-370.0");
  });
  it("formatQuantity(x, Infinity, unit) says the uncertainty was not estimated", () => {
    expect(formatQuantity(0.85, Infinity, "1").text).toBe("0.85 (uncertainty not estimated)");
    expect(formatQuantity(0.85, NaN, "1").note).toBe("uncertainty not estimated");
  });
  it("formatQuantity(20000, 1200, 'counts', {style: 'paren'}) spells out the uncertainty above the units digit", () => {
    expect(formatQuantity(20012, 1234, "counts", { style: "paren" }).text).toBe("20000(1200) counts");
  });
  it("formatQuantity rejects a bad prefix or style by name", () => {
    expect(() => formatQuantity(1, 0.1, "m", { prefix: "x" })).toThrow(/invalid prefix: "x"/);
    expect(() => formatQuantity(1, 0.1, "m", { style: "bad" as "pm" })).toThrow(/invalid style/);
  });
});

describe("formatParameter(parameter, options)", () => {
  const base: FitParameter = {
    name: "wavelength", unit: "m", value: 6.328e-7, uncertainty: 0, fixed: true, tied: null,
    atBound: null, lower: 0, upper: Infinity,
  };
  it("formatParameter(fixed) prints the value without ± and marks it fixed", () => {
    expect(formatParameter(base).text).toBe("632.8 nm (fixed)");
  });
  it("formatParameter(at upper bound) keeps the numbers and marks the bound", () => {
    const p = { ...base, name: "visibility", unit: "1", value: 1, uncertainty: 0.02, fixed: false, atBound: "upper" as const };
    expect(formatParameter(p).text).toBe("1.000 ± 0.020 (at upper bound)");
  });
});

describe("roundPair against Python's decimal module (exact binary values, round half up)", () => {
  const python = "/usr/bin/python3";
  const haveps = existsSync(python);
  if (!haveps) console.warn("SKIPPED: roundPair reference check (/usr/bin/python3 not found)");
  it.skipIf(!haveps)("roundPair(value, uncertainty, digits) equals the decimal-module result for 2000 seeded cases", () => {
    const rng = createRandom(2024);
    const cases: [number, number, number][] = [];
    for (let i = 0; i < 2000; i++) {
      const u = 10 ** (rng.uniform() * 16 - 12) * (1 + rng.uniform() * 9);
      const v = (rng.uniform() < 0.5 ? -1 : 1) * u * 10 ** (rng.uniform() * 6 - 1);
      cases.push([v, u, 1 + Math.floor(rng.uniform() * 3)]);
    }
    const script = fileURLToPath(new URL("./reference/round_pair.py", import.meta.url));
    const expected = JSON.parse(execFileSync(python, [script], { input: JSON.stringify(cases) }).toString()) as [string, string][];
    const mismatches = cases
      .map(([v, u, d], i) => ({ v, u, d, got: roundPair(v, u, d), want: expected[i] }))
      .filter((c) => c.got.value !== c.want[0] || c.got.uncertainty !== c.want[1]);
    expect(expected.length).toBe(cases.length);
    // The cases cover rounding above the units digit and far below it.
    expect(cases.filter(([v, u, d]) => roundPair(v, u, d).lastDigit > 0).length).toBeGreaterThan(100);
    expect(cases.filter(([v, u, d]) => roundPair(v, u, d).lastDigit < -8).length).toBeGreaterThan(100);
    expect(mismatches.slice(0, 5)).toEqual([]);
  });
});
