/**
 * A fit model written by the user as a formula string in one variable `x` (metres for profiles).
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model, ParameterSpec } from "../physics/model.js";
import { rememberModelSource } from "../physics/modelSource.js";
import { compileFormula, freeSymbols, type CompiledFormula } from "./formula.js";

/** Options of {@link formulaModel}. */
export interface FormulaModelOptions {
  /** Parameters, as names or full specs; default: every free name of the formula except the variable, in order of appearance. */
  parameters?: readonly (string | ParameterSpec)[];
  /** Name of the position variable (default "x"). */
  variable?: string;
  /** Model id for results (default "formula"). */
  id?: string;
  /** Use the symbolic Jacobian when every derivative exists (default true); otherwise the fitter differentiates numerically. */
  symbolicJacobian?: boolean;
}

/**
 * Build a {@link Model} from a formula such as `"a*exp(-((x-c)/w)^2) + b"`.
 * The formula is parsed by mathjs and compiled safely (see compileFormula); the Jacobian is the
 * symbolic derivative when mathjs can form it for every parameter.
 * Units: x is whatever the profile's x is (m); parameter units are "1" unless a spec says otherwise.
 * @example formulaModel("b1*(1-exp(-b2*x))").parameters.map((p) => p.name) // ["b1", "b2"]
 */
export function formulaModel(expression: string, options: FormulaModelOptions = {}): Model {
  const variable = options.variable ?? "x";
  const given = options.parameters ?? freeSymbols(expression).filter((name) => name !== variable);
  if (given.length === 0) throw new InvalidArgumentError("formula", expression, "it must contain at least one parameter besides the variable");
  const parameters: ParameterSpec[] = given.map((p) => typeof p === "string"
    ? { name: p, unit: "1", default: 1, lower: -Infinity, upper: Infinity, description: `formula parameter ${p}` }
    : { ...p });
  const names = parameters.map((p) => p.name);
  if (new Set(names).size !== names.length) throw new InvalidArgumentError("formula parameters", names, "distinct names");
  if (names.includes(variable)) throw new InvalidArgumentError("formula parameters", variable, `the variable "${variable}" cannot also be a parameter`);
  const compiled = compileFormula(expression, { vectors: [variable], scalars: names });
  let derivatives: (CompiledFormula | null)[] | null = null;
  if (options.symbolicJacobian !== false) {
    derivatives = names.map((name) => compiled.derivative(name));
    if (derivatives.some((d) => d === null)) derivatives = null;
  }
  const vectors: Float64Array[] = [new Float64Array(0)];
  let column = new Float64Array(0);
  const model: Model = {
    id: options.id ?? "formula",
    description: `formula: ${expression}`,
    parameters,
    evaluate(x, params, out) {
      vectors[0] = x;
      compiled.evaluate(vectors, params, out);
    },
  };
  if (derivatives) {
    const ds = derivatives as CompiledFormula[];
    const p = names.length;
    (model as { jacobian?: Model["jacobian"] }).jacobian = (x, params, jac, out) => {
      vectors[0] = x;
      if (column.length !== x.length) column = new Float64Array(x.length);
      for (let j = 0; j < p; j++) {
        ds[j].evaluate(vectors, params, column);
        for (let i = 0; i < x.length; i++) jac[i * p + j] = column[i];
      }
      if (out) compiled.evaluate(vectors, params, out);
    };
  }
  return rememberModelSource(model, { id: model.id, options: {}, formula: { expression, variable, parameters: parameters.map((p) => ({ ...p })) } });
}
