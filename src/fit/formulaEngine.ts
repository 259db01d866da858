/**
 * The formula engine (mathjs's parse and symbolic derivative), loaded on the first formula
 * instead of at import: loading mathjs took about half of `import("fringekit")`, and most
 * sessions never write a formula. In Node it is loaded synchronously from mathjs's single-file
 * build through the runtime's own module loader (no import of node:* here, so src/ stays
 * runtime-neutral); a browser bundle that needs formulas hands it over with setFormulaEngine.
 */
import type { derivative, MathNode, parse } from "mathjs";
import { FringekitError } from "../errors.js";

/** The two mathjs functions formulas use. */
export interface FormulaEngine {
  parse: typeof parse;
  derivative: typeof derivative;
}

let engine: FormulaEngine | undefined;

/** Give fringekit the mathjs functions to use for formulas (for browser bundles; Node finds mathjs by itself). */
export function setFormulaEngine(math: FormulaEngine): void {
  engine = math;
}

/** The formula engine, loading mathjs on first use in Node. */
export function formulaEngine(): FormulaEngine {
  if (engine) return engine;
  type ModuleApi = { createRequire(from: string): (id: string) => unknown };
  const runtime = (globalThis as { process?: { getBuiltinModule?: (id: string) => unknown } }).process;
  const moduleApi = runtime?.getBuiltinModule?.("node:module") as ModuleApi | undefined;
  if (!moduleApi) {
    throw new FringekitError("no-formula-engine", "formulas need mathjs: in a browser bundle call setFormulaEngine(math) with mathjs first; in Node use version 20.16 or later");
  }
  engine = moduleApi.createRequire(import.meta.url)("mathjs/lib/browser/math.js") as FormulaEngine;
  return engine;
}

/** Parse formula text into a mathjs syntax tree (never evaluated by mathjs). */
export function parseFormula(text: string): MathNode {
  return formulaEngine().parse(text);
}

/**
 * Symbolic derivative of a syntax tree with respect to `name`. Pass `{ simplify: false }` for
 * untrusted formulas: mathjs's simplification is exponential on sums of many terms.
 */
export function formulaDerivative(tree: MathNode, name: string, options?: { simplify: boolean }): MathNode {
  return formulaEngine().derivative(tree, name, options);
}
