/**
 * Which model parameters are free, fixed or tied, with their bounds: validated once at the API
 * edge, then used to map the solver's free vector θ to the model's full parameter vector.
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model } from "../physics/model.js";
import { compileFormula, type CompiledFormula } from "./formula.js";

/** A tie: parameter `index` = formula of the other parameters. */
interface Tie {
  index: number;
  expression: string;
  formula: CompiledFormula;
  /** Symbolic derivative by each model parameter (null where not available). */
  derivatives: (CompiledFormula | null)[];
}

/** The validated plan of one model's parameters. */
export interface ParameterPlan {
  model: Model;
  names: string[];
  /** Model index of each free parameter, in solver order. */
  free: number[];
  /** Full vector holding the fixed values (and the start of the free ones). */
  base: Float64Array;
  /** Solver bounds of the free parameters. */
  lower: Float64Array;
  upper: Float64Array;
  fixed: boolean[];
  tiedExpression: (string | null)[];
  ties: Tie[];
}

/** What a plan is built from (the parameter-related fit options). */
export interface PlanOptions {
  start?: Record<string, number>;
  fix?: Record<string, number> | string[];
  free?: string[];
  tie?: Record<string, string>;
  bounds?: Record<string, [number, number]>;
}

/**
 * Validates fix/free/tie/bounds/start against the model and builds the plan.
 * Start values come from `options.start`, then `guess`, then the parameter default.
 * @throws InvalidArgumentError naming the option and parameter at fault
 */
export function makePlan(model: Model, options: PlanOptions, guess: Record<string, number> = {}): ParameterPlan {
  const names = model.parameters.map((s) => s.name);
  const known = new Set(names);
  const check = (option: string, name: string): number => {
    if (!known.has(name)) throw new InvalidArgumentError(`${option} parameter`, name, `model ${model.id} has ${names.join(", ")}`);
    return names.indexOf(name);
  };
  const base = Float64Array.from(model.parameters, (s) => s.default);
  for (const [name, value] of Object.entries(guess)) if (known.has(name) && Number.isFinite(value)) base[names.indexOf(name)] = value;
  for (const [name, value] of Object.entries(options.start ?? {})) {
    const j = check("start", name);
    if (!Number.isFinite(value)) throw new InvalidArgumentError(`start.${name}`, value, `a finite number in ${model.parameters[j].unit}`);
    base[j] = value;
  }
  const fixed = model.parameters.map((s) => Boolean(s.fixedByDefault || s.integer));
  for (const name of options.free ?? []) {
    const j = check("free", name);
    if (model.parameters[j].integer) throw new InvalidArgumentError("free parameter", name, "integer parameters are never fitted; fix them at the value you want");
    fixed[j] = false;
  }
  if (Array.isArray(options.fix)) {
    for (const name of options.fix) fixed[check("fix", name)] = true;
  } else if (options.fix) {
    for (const [name, value] of Object.entries(options.fix)) {
      const j = check("fix", name);
      if (!Number.isFinite(value)) throw new InvalidArgumentError(`fix.${name}`, value, `a finite number in ${model.parameters[j].unit}`);
      fixed[j] = true; base[j] = value;
    }
  }
  const lowerAll = Float64Array.from(model.parameters, (s) => s.lower);
  const upperAll = Float64Array.from(model.parameters, (s) => s.upper);
  for (const [name, range] of Object.entries(options.bounds ?? {})) {
    const j = check("bounds", name);
    if (!Array.isArray(range) || range.length !== 2 || !(range[0] <= range[1]) || Number.isNaN(range[0]) || Number.isNaN(range[1])) {
      throw new InvalidArgumentError(`bounds.${name}`, range, "[lower, upper] with lower <= upper (use ±Infinity for none)");
    }
    lowerAll[j] = range[0]; upperAll[j] = range[1];
  }
  const tiedExpression: (string | null)[] = names.map(() => null);
  const tieEntries = Object.entries(options.tie ?? {});
  for (const [name, expression] of tieEntries) tiedExpression[check("tie", name)] = expression;
  const ties: Tie[] = tieEntries.map(([name, expression]) => {
    const index = names.indexOf(name);
    const formula = compileFormula(expression, { vectors: [], scalars: names });
    for (const [other] of tieEntries) {
      if (new RegExp(`\\b${other}\\b`).test(expression)) {
        throw new InvalidArgumentError(`tie.${name}`, expression, `it refers to ${other}, which is itself tied; tie to free or fixed parameters only`);
      }
    }
    return { index, expression, formula, derivatives: names.map((n) => formula.derivative(n)) };
  });
  const free: number[] = [];
  names.forEach((_, j) => { if (!fixed[j] && tiedExpression[j] === null) free.push(j); });
  for (const j of free) {
    const given = options.start?.[names[j]] !== undefined;
    if (given && (base[j] < lowerAll[j] || base[j] > upperAll[j])) {
      throw new InvalidArgumentError(`start.${names[j]}`, base[j], `inside the bounds [${lowerAll[j]}, ${upperAll[j]}] ${model.parameters[j].unit}`);
    }
    base[j] = Math.min(upperAll[j], Math.max(lowerAll[j], base[j])); // defaults and guesses move inside
  }
  return {
    model, names, free, base,
    lower: Float64Array.from(free, (j) => lowerAll[j]),
    upper: Float64Array.from(free, (j) => upperAll[j]),
    fixed, tiedExpression, ties,
  };
}

const scratch = new Float64Array(1);
const noVectors: Float64Array[] = [];

/** Writes the full model vector for free values θ into `full` (fixed values from the plan, ties evaluated). */
export function expandParameters(plan: ParameterPlan, theta: Float64Array, full: Float64Array): void {
  full.set(plan.base);
  for (let k = 0; k < plan.free.length; k++) full[plan.free[k]] = theta[k];
  for (const tie of plan.ties) {
    tie.formula.evaluate(noVectors, full, scratch);
    full[tie.index] = scratch[0];
  }
}

/**
 * d(full)/dθ as a P × nFree row-major matrix (identity rows for free parameters, tie gradients
 * for tied ones, zero for fixed), evaluated at `full`.
 */
export function expansionJacobian(plan: ParameterPlan, full: Float64Array, out: Float64Array): void {
  const q = plan.free.length;
  out.fill(0);
  plan.free.forEach((j, k) => { out[j * q + k] = 1; });
  for (const tie of plan.ties) {
    plan.free.forEach((j, k) => {
      const d = tie.derivatives[j];
      let value: number;
      if (d) { d.evaluate(noVectors, full, scratch); value = scratch[0]; }
      else {
        const h = 1e-6 * Math.max(Math.abs(full[j]), 1e-300);
        const keep = full[j];
        full[j] = keep + h; tie.formula.evaluate(noVectors, full, scratch); const up = scratch[0];
        full[j] = keep - h; tie.formula.evaluate(noVectors, full, scratch); const down = scratch[0];
        full[j] = keep;
        value = (up - down) / (2 * h);
      }
      out[tie.index * q + k] = value;
    });
  }
}
