// formulaModel(hostile formula) in bounded time, every failure an InvalidArgumentError: sums of
// many parameter terms (symbolic simplification after differentiation was exponential), a
// formula far above the length limit (the name scan ran first), and deep nesting within the
// limit (a raw RangeError from recursion). Expected derivatives: d/dp_k Σ p_i x = x (calculus).
import { describe, expect, it } from "vitest";
import { InvalidArgumentError, formulaModel } from "../../src/index.js";

const MAX_MS = 5000; // generous: the exponential versions take 30 s to minutes
function timed<T>(fn: () => T): { value?: T; error?: unknown; ms: number } {
  const start = performance.now();
  try { return { value: fn(), ms: performance.now() - start }; } catch (error) { return { error, ms: performance.now() - start }; }
}
const sum = (n: number) => Array.from({ length: n }, (_, i) => `p${i}*x`).join("+");

describe("formulaModel(hostile formula)", () => {
  for (const n of [22, 40]) {
    it(`formulaModel("p0*x+…+p${n - 1}*x") builds with a symbolic Jacobian quickly`, () => {
      const { value: model, error, ms } = timed(() => formulaModel(sum(n)));
      expect(error).toBeUndefined();
      expect(ms).toBeLessThan(MAX_MS);
      const x = Float64Array.from([0.5, 2]);
      const jac = new Float64Array(2 * n);
      model!.jacobian!(x, new Float64Array(n).fill(1), jac);
      expect(jac[0]).toBe(0.5); // ∂/∂p0 at x = 0.5
      expect(jac[2 * n - 1]).toBe(2); // ∂/∂p_{n-1} at x = 2
    });
  }

  it("formulaModel(product of 26 parameters times exp(-x)) builds quickly", () => {
    const formula = `${Array.from({ length: 26 }, (_, i) => `q${i}`).join("*")}*exp(-x)`;
    const { error, ms } = timed(() => formulaModel(formula));
    expect(error).toBeUndefined();
    expect(ms).toBeLessThan(MAX_MS);
  });

  it("formulaModel(a 689 KB formula) is refused by its length before any scan", () => {
    const { error, ms } = timed(() => formulaModel(sum(50_000)));
    expect(error).toBeInstanceOf(InvalidArgumentError);
    expect((error as Error).message).toMatch(/at most 4000 characters/);
    expect(ms).toBeLessThan(500);
  });

  const deep: [string, string][] = [
    ["1800 nested parentheses", `a*${"(".repeat(1800)}x${")".repeat(1800)}`],
    ["900 nested sin()", `a*${"sin(".repeat(900)}x${")".repeat(900)}`],
    ["1300 chained powers", `a*${Array.from({ length: 1300 }, () => "x").join("^")}`],
    ["1900 unary minus signs", `a*${"-".repeat(1900)}x`],
  ];
  for (const [title, formula] of deep) {
    it(`formulaModel(${title}) gives an invalid-formula error, not an internal one`, () => {
      const { error, ms } = timed(() => formulaModel(formula));
      if (error !== undefined) {
        expect(error).toBeInstanceOf(InvalidArgumentError);
        expect((error as Error).message).toMatch(/formula/);
      }
      expect(ms).toBeLessThan(MAX_MS);
    });
  }
});
