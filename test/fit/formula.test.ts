import { describe, expect, it } from "vitest";
import { InvalidArgumentError } from "../../src/errors.js";
import { compileFormula } from "../../src/fit/formula.js";
import { formulaModel } from "../../src/fit/formulaModel.js";

const x = Float64Array.from([0.5, 1, 2, 3]);

describe("compileFormula(expression, names)", () => {
  it("evaluates elementary functions like Math does (common practice)", () => {
    const f = compileFormula("a*exp(-b*x) + c*sin(x)^2 - atan(x/a) + 2^3", { vectors: ["x"], scalars: ["a", "b", "c"] });
    const out = new Float64Array(4);
    f.evaluate([x], Float64Array.from([2, 0.3, 1.5]), out);
    x.forEach((v, i) => expect(out[i]).toBeCloseTo(2 * Math.exp(-0.3 * v) + 1.5 * Math.sin(v) ** 2 - Math.atan(v / 2) + 8, 13));
  });
  it("derivative(name) matches the hand derivative of a*exp(-b*x) (calculus, common practice)", () => {
    const f = compileFormula("a*exp(-b*x)", { vectors: ["x"], scalars: ["a", "b"] });
    const d = f.derivative("b");
    expect(d).not.toBeNull();
    const out = new Float64Array(4);
    d!.evaluate([x], Float64Array.from([2, 0.3]), out);
    x.forEach((v, i) => expect(out[i]).toBeCloseTo(-2 * v * Math.exp(-0.3 * v), 13));
  });
  const hostile = [
    "import({evil: 1}, {override: true})",
    "createUnit('foo')",
    "evaluate('1+1')",
    "parse('x')",
    "compile('x')",
    "simplify('x')",
    "x.constructor",
    "cos.constructor('return process')()",
    "x[\"constructor\"]",
    "f(t) = t^2",
    "a = 3",
    "[1, 2, 3]",
    "{a: 1}",
    "\"text\"",
    "x ? 1 : 2",
    "__proto__",
    "constructor",
    "toString(x)",
    "1:3",
    "a; b",
    "5 cm",
    "x'",
    "eval(x)",
    "Function('return 1')",
  ];
  for (const expression of hostile) {
    it(`refuses ${JSON.stringify(expression)} with InvalidArgumentError`, () => {
      expect(() => compileFormula(expression, { vectors: ["x"], scalars: ["a", "b"] })).toThrow(InvalidArgumentError);
    });
  }
  it("refuses parameter names that shadow Object.prototype keys", () => {
    expect(() => compileFormula("constructor*x", { vectors: ["x"], scalars: ["constructor"] })).toThrow(InvalidArgumentError);
  });
  it("refuses an overlong formula", () => {
    expect(() => compileFormula("x+".repeat(3000) + "x", { vectors: ["x"], scalars: [] })).toThrow(/at most/);
  });
});

describe("formulaModel(expression)", () => {
  it("infers parameters in order of appearance and provides a symbolic Jacobian", () => {
    const model = formulaModel("amp*exp(-((x-c)/w)^2) + bg");
    expect(model.parameters.map((p) => p.name)).toEqual(["amp", "c", "w", "bg"]);
    expect(typeof model.jacobian).toBe("function");
    const params = Float64Array.from([3, 1, 0.7, 0.2]);
    const jac = new Float64Array(4 * 4), out = new Float64Array(4), up = new Float64Array(4), down = new Float64Array(4);
    model.jacobian!(x, params, jac, out);
    for (let j = 0; j < 4; j++) {
      const h = 1e-6;
      const pu = Float64Array.from(params); pu[j] += h;
      const pd = Float64Array.from(params); pd[j] -= h;
      model.evaluate(x, pu, up); model.evaluate(x, pd, down);
      // Central difference, error O(h²) (common practice).
      for (let i = 0; i < 4; i++) expect(jac[i * 4 + j]).toBeCloseTo((up[i] - down[i]) / (2 * h), 7);
    }
  });
});
