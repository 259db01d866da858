/**
 * Fit options may give parameter values as numbers in SI or as text with a unit ("532 nm",
 * "0.85 m", "5.5 um", "2 mrad"), as the command line does. This turns them into SI numbers
 * once, at the API edge, and refuses lengths no optical bench can have (src/units/plausibility).
 */
import { InvalidArgumentError } from "../errors.js";
import type { Model, ParameterSpec } from "../physics/model.js";
import { checkPlausibleLength } from "../units/plausibility.js";
import { parseQuantity } from "../units/parseQuantity.js";
import type { FitOptions, QuantityInput, ResolvedFitOptions } from "./types.js";

const NUMBER_AND_UNIT = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/;

/**
 * One parameter value in SI: a number as given, or text with a unit of the parameter's kind
 * (lengths in any length unit, angles in rad/mrad/deg, dimensionless numbers bare, other units
 * bare or in their own symbol, e.g. "1200 counts"). Lengths are checked for plausibility.
 * @param spec     the parameter (its unit decides how text is read)
 * @param input    number (SI) or text such as "532 nm"
 * @param argument name for messages, e.g. "start.wavelength"
 * @throws InvalidArgumentError for unreadable text, a unit of the wrong kind, or an implausible length
 */
export function parameterValue(spec: ParameterSpec, input: QuantityInput, argument: string): number {
  let value: number;
  let written: number;
  if (typeof input === "number") {
    value = input;
    written = input;
  } else if (typeof input === "string") {
    const match = NUMBER_AND_UNIT.exec(input);
    written = match ? Number(match[1]) : NaN;
    if (spec.unit === "m") value = parseQuantity(input, "length", argument).value;
    else if (spec.unit === "rad") value = parseQuantity(input, "angle", argument).value;
    else if (spec.unit === "1" || spec.unit === "") value = parseQuantity(input, "dimensionless", argument).value;
    else {
      if (!match || (match[2] !== "" && match[2] !== spec.unit)) throw new InvalidArgumentError(argument, input, `a number in ${spec.unit}, e.g. "1200" or "1200 ${spec.unit}"`);
      value = Number(match[1]);
    }
  } else {
    throw new InvalidArgumentError(argument, input, `a number in ${spec.unit} or text with a unit, e.g. "532 nm"`);
  }
  if (!Number.isFinite(value)) throw new InvalidArgumentError(argument, input, `a finite number in ${spec.unit}`);
  if (spec.unit === "m") checkPlausibleLength(spec.name, value, argument, written);
  return value;
}

/**
 * Fit options with every start, fix and bound value in SI numbers (text with units parsed,
 * lengths checked for plausibility). Names not in the model are left for makePlan to report.
 * @param model   the model fitted
 * @param options the options as the caller gave them
 */
export function resolveFitOptions(model: Model, options: FitOptions): ResolvedFitOptions {
  const spec = (name: string): ParameterSpec | undefined => model.parameters.find((p) => p.name === name);
  const convert = (record: Record<string, QuantityInput> | undefined, option: string): Record<string, number> | undefined => {
    if (record === undefined) return undefined;
    const out: Record<string, number> = {};
    for (const [name, value] of Object.entries(record)) {
      const s = spec(name);
      out[name] = s ? parameterValue(s, value, `${option}.${name}`) : (value as number);
    }
    return out;
  };
  const resolved: ResolvedFitOptions = { ...options, start: convert(options.start, "start"), fix: Array.isArray(options.fix) ? options.fix : convert(options.fix, "fix") } as ResolvedFitOptions;
  if (options.start === undefined) delete resolved.start;
  if (options.fix === undefined) delete resolved.fix;
  if (options.bounds !== undefined) {
    const bounds: Record<string, [number, number]> = {};
    for (const [name, range] of Object.entries(options.bounds)) {
      const s = spec(name);
      // Bounds are not checked for plausibility: ±Infinity and wide limits are legitimate.
      const one = (v: QuantityInput, side: string): number => (typeof v === "string" && s ? parseBound(s, v, `bounds.${name} ${side}`) : (v as number));
      bounds[name] = Array.isArray(range) && range.length === 2 ? [one(range[0], "lower"), one(range[1], "upper")] : (range as unknown as [number, number]);
    }
    resolved.bounds = bounds;
  }
  return resolved;
}

function parseBound(spec: ParameterSpec, text: string, argument: string): number {
  const t = text.trim();
  if (/^[+]?(inf|infinity|∞)$/i.test(t)) return Infinity;
  if (/^-(inf|infinity|∞)$/i.test(t)) return -Infinity;
  if (spec.unit === "m") return parseQuantity(text, "length", argument).value;
  if (spec.unit === "rad") return parseQuantity(text, "angle", argument).value;
  if (spec.unit === "1" || spec.unit === "") return parseQuantity(text, "dimensionless", argument).value;
  const match = NUMBER_AND_UNIT.exec(text);
  if (!match || (match[2] !== "" && match[2] !== spec.unit)) throw new InvalidArgumentError(argument, text, `a number in ${spec.unit}`);
  return Number(match[1]);
}
