/**
 * --set, --fix, --noise and --max-evaluations words → fit options in SI, checked against the
 * model's parameters.
 */
import { formatQuantity, InvalidArgumentError, parseQuantity, type FitResult, type Model, type NoiseModelId, type ParameterSpec } from "../src/advanced.js";
import type { CommandFitOptions } from "./engine.js";
import { UsageError } from "./usageError.js";

const NOISE = ["auto", "poisson", "gaussian", "robust"] as const;

/**
 * Builds fit options from the command line.
 * @param model the model being fitted
 * @param sets  "NAME=VALUE[UNIT]" words of --set (starting values)
 * @param fixes "NAME" or "NAME=VALUE[UNIT]" words of --fix
 * @param noise the --noise word
 * @param maxEvaluations the --max-evaluations word (a whole number of model evaluations per start)
 */
export function fitSettings(model: Model, sets: readonly string[], fixes: readonly string[], noise: string | undefined, maxEvaluations?: string): CommandFitOptions {
  const options: CommandFitOptions = {};
  const start: Record<string, number> = {};
  const fix: Record<string, number> = {};
  for (const word of sets) {
    const [name, value] = splitAssignment(word, "--set", true);
    const spec = findParameter(model, name, "--set");
    start[name] = parseParameterValue(spec, value!, `--set ${name}`);
    // A value set for a parameter that is normally held fixed (e.g. wavelength) is used as given.
    if (spec.fixedByDefault) fix[name] = start[name]!;
  }
  for (const word of fixes) {
    const [name, value] = splitAssignment(word, "--fix", false);
    const spec = findParameter(model, name, "--fix");
    fix[name] = value !== undefined ? parseParameterValue(spec, value, `--fix ${name}`) : (start[name] ?? spec.default);
  }
  for (const name of Object.keys(fix)) delete start[name];
  if (Object.keys(start).length > 0) options.start = start;
  if (Object.keys(fix).length > 0) options.fix = fix;
  if (noise !== undefined) {
    if (!(NOISE as readonly string[]).includes(noise)) throw new UsageError(`invalid --noise: "${noise}" (one of ${NOISE.join(", ")})`);
    options.noise = noise as NoiseModelId | "auto";
  }
  if (maxEvaluations !== undefined) {
    const limit = Number(maxEvaluations);
    if (!/^\d+$/.test(maxEvaluations) || !(limit >= 1) || !Number.isSafeInteger(limit)) {
      throw new UsageError(`invalid --max-evaluations: "${maxEvaluations}" (a whole number of model evaluations from 1, e.g. 5000)`);
    }
    options.maxEvaluations = limit;
  }
  return options;
}

function splitAssignment(word: string, option: string, valueRequired: boolean): [string, string | undefined] {
  const eq = word.indexOf("=");
  if (eq < 0) {
    if (valueRequired) throw new UsageError(`invalid ${option} "${word}": write NAME=VALUE[UNIT], e.g. ${option} wavelength=632.8nm`);
    return [word.trim(), undefined];
  }
  const name = word.slice(0, eq).trim();
  const value = word.slice(eq + 1).trim();
  if (name === "" || value === "") throw new UsageError(`invalid ${option} "${word}": write NAME=VALUE[UNIT], e.g. ${option} wavelength=632.8nm`);
  return [name, value];
}

function findParameter(model: Model, name: string, option: string): ParameterSpec {
  const spec = model.parameters.find((p) => p.name === name);
  if (!spec) throw new UsageError(`invalid ${option}: model "${model.id}" has no parameter "${name}" (parameters: ${model.parameters.map((p) => p.name).join(", ")})`);
  return spec;
}

/**
 * Parses a parameter value with an optional unit into SI: lengths in any length unit, angles in
 * rad/mrad/deg, dimensionless numbers bare; other units (counts, ...) bare or in their SI symbol.
 * @param spec     the parameter
 * @param text     "632.8nm", "0.5 mm", "0.3", "3"
 * @param argument name for messages
 */
export function parseParameterValue(spec: ParameterSpec, text: string, argument: string): number {
  let value: number;
  if (spec.unit === "m") value = parseQuantity(text, "length", argument).value;
  else if (spec.unit === "rad") value = parseQuantity(text, "angle", argument).value;
  else if (spec.unit === "1" || spec.unit === "") value = parseQuantity(text, "dimensionless", argument).value;
  else {
    const match = /^([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(text.trim());
    if (!match || (match[2] !== "" && match[2] !== spec.unit)) throw new InvalidArgumentError(argument, text, `a number in ${spec.unit}`);
    value = Number(match[1]);
  }
  if (spec.integer && !Number.isInteger(value)) throw new InvalidArgumentError(argument, text, "a whole number");
  if (value < spec.lower || value > spec.upper) throw new InvalidArgumentError(argument, text, `between ${spec.lower} and ${spec.upper} ${spec.unit}`);
  return value;
}

/** A parameter held at its model default because the command line did not give it. */
export interface AssumedDefault {
  code: "assumed-default";
  parameter: string;
  /** The default as printed, e.g. "632.8 nm". */
  valueText: string;
  message: string;
}

/**
 * Parameters that are fixed by default at a non-zero value (wavelength, distance, number of
 * slits, ...) and that the user did not give: the fitted values depend on them, so say so.
 * (Effects switched off by a default of 0, such as blur, are left out.)
 * @param model    the model fitted
 * @param settings the options built by fitSettings (values in SI)
 */
export function assumedDefaults(model: Model, settings: CommandFitOptions): AssumedDefault[] {
  const fix = settings.fix;
  const given = (name: string): boolean => (Array.isArray(fix) ? fix.includes(name) : fix?.[name] !== undefined);
  return model.parameters
    .filter((p) => p.fixedByDefault && p.default !== 0 && !given(p.name))
    .map((p) => {
      const valueText = formatQuantity(p.default, 0, p.unit).text;
      const message = `${p.name} not given: held at the model default ${valueText}; give the real value with --fix ${p.name}=VALUE`;
      return { code: "assumed-default", parameter: p.name, valueText, message };
    });
}

/**
 * The note under the printed table naming every assumed default (none when there are none).
 * @param assumed the list from assumedDefaults (of one or several models)
 */
export function assumedDefaultsNote(assumed: readonly AssumedDefault[]): string[] {
  const values = new Map(assumed.map((a) => [a.parameter, a.valueText]));
  if (values.size === 0) return [];
  const list = [...values].map(([name, value]) => `${name} ${value}`).join(", ");
  const example = [...values.keys()].map((name) => `--fix ${name}=VALUE`).join(" ");
  return [`Held at model defaults because not given: ${list}. The fitted values depend on them; give the real ones with ${example}.`];
}

/**
 * Why a fit stopped without converging, in the command's words (options named as on the
 * command line rather than as library options).
 * @param result the fit that did not converge
 */
export function notConvergedText(result: FitResult): string {
  if (result.reason === "max-evaluations") return `stopped after ${result.evaluations} model evaluations without converging; ${MORE_EVALUATIONS}`;
  return result.message;
}

/**
 * One phrase for several fits that did not converge, models with the same reason grouped
 * ("two-slit and n-slit stopped after 2 model evaluations ...; raise --max-evaluations ...").
 * @param stuck the model ids and their fits
 */
export function notConvergedSummary(stuck: readonly { id: string; fit: FitResult }[]): string {
  const groups = new Map<string, string[]>();
  for (const { id, fit } of stuck) {
    const why = fit.reason === "max-evaluations" ? `stopped after ${fit.evaluations} model evaluations without converging` : fit.message;
    groups.set(why, [...(groups.get(why) ?? []), id]);
  }
  const parts = [...groups].map(([why, ids]) => `${ids.join(" and ")} ${why}`);
  if (stuck.some(({ fit }) => fit.reason === "max-evaluations")) parts.push(MORE_EVALUATIONS);
  return parts.join("; ");
}

const MORE_EVALUATIONS = "raise --max-evaluations or give starting values with --set NAME=VALUE";
