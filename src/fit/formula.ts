/**
 * Safe compiled formulas. A formula string is parsed by mathjs into a syntax tree; the tree is
 * checked against a whitelist (numbers, the declared names, + − × ÷ ^, and a fixed list of
 * elementary functions) and then compiled into closures that evaluate the whole data vector at
 * once into reused buffers. mathjs is never asked to evaluate anything, so no formula can reach
 * import, createUnit, evaluate, parse, property access, assignment or any JavaScript object.
 * Derivatives come from mathjs's symbolic `derivative`, checked by the same whitelist.
 */
import type { MathNode } from "mathjs";
import { InvalidArgumentError } from "../errors.js";
import { formulaDerivative as symbolicDerivative, parseFormula as parse } from "./formulaEngine.js";

/** Longest formula accepted (characters); longer strings are refused before parsing. */
export const MAX_FORMULA_LENGTH = 4000;

/** Named constants a formula may use (exact double values of π, e, τ). */
const CONSTANTS: Readonly<Record<string, number>> = { pi: Math.PI, e: Math.E, tau: 2 * Math.PI };

const sec = (v: number): number => 1 / Math.cos(v);
const csc = (v: number): number => 1 / Math.sin(v);
const cot = (v: number): number => 1 / Math.tan(v);
/** Functions of one argument a formula may call. */
const UNARY: ReadonlyMap<string, (v: number) => number> = new Map<string, (v: number) => number>([
  ["exp", Math.exp], ["log", Math.log], ["log10", Math.log10], ["log2", Math.log2], ["log1p", Math.log1p],
  ["expm1", Math.expm1], ["sqrt", Math.sqrt], ["cbrt", Math.cbrt], ["abs", Math.abs], ["sign", Math.sign],
  ["sin", Math.sin], ["cos", Math.cos], ["tan", Math.tan], ["asin", Math.asin], ["acos", Math.acos],
  ["atan", Math.atan], ["sinh", Math.sinh], ["cosh", Math.cosh], ["tanh", Math.tanh],
  ["asinh", Math.asinh], ["acosh", Math.acosh], ["atanh", Math.atanh],
  ["sec", sec], ["csc", csc], ["cot", cot],
  ["sech", (v) => 1 / Math.cosh(v)], ["csch", (v) => 1 / Math.sinh(v)], ["coth", (v) => 1 / Math.tanh(v)],
  ["square", (v) => v * v], ["cube", (v) => v * v * v],
]);
/** Functions of two arguments a formula may call. */
const BINARY: ReadonlyMap<string, (a: number, b: number) => number> = new Map<string, (a: number, b: number) => number>([
  ["add", (a, b) => a + b], ["subtract", (a, b) => a - b], ["multiply", (a, b) => a * b],
  ["divide", (a, b) => a / b], ["pow", Math.pow], ["atan2", Math.atan2], ["hypot", Math.hypot],
  ["log", (a, b) => Math.log(a) / Math.log(b)],
]);

/** Names a formula uses: per-point vectors (e.g. x) and scalars (parameters). */
export interface FormulaNames {
  /** Names bound to a data vector (one value per point), e.g. ["x"]. */
  vectors: readonly string[];
  /** Names bound to one number each (parameters), in the order of the scalars array. */
  scalars: readonly string[];
}

/** A compiled formula: evaluates at every point into `out`. */
export interface CompiledFormula {
  readonly expression: string;
  /** Evaluate with one Float64Array per vector name (all length n) and the scalar values. */
  evaluate(vectors: readonly Float64Array[], scalars: Float64Array, out: Float64Array): void;
  /** Symbolic derivative with respect to a scalar, or null when mathjs cannot differentiate it. */
  derivative(scalarName: string): CompiledFormula | null;
}

type Context = { n: number; vectors: readonly Float64Array[]; scalars: Float64Array };
type Compiled = { scalar: true; f: (c: Context) => number } | { scalar: false; f: (c: Context) => Float64Array };

const NAME_PATTERN = /^[A-Za-z][A-Za-z0-9_]*$/;

/** Checks that a name can be used in a formula (identifier, not a constant or function, not an Object.prototype key). */
export function checkFormulaName(name: string, where: string): void {
  if (!NAME_PATTERN.test(name) || name in CONSTANTS || UNARY.has(name) || BINARY.has(name) || name in Object.prototype) {
    throw new InvalidArgumentError(where, name, "a name of letters, digits and _ starting with a letter, not a function or constant name (pi, e, tau)");
  }
}

/**
 * Parse and compile a formula such as "b1*(1-exp(-b2*x))".
 * @throws InvalidArgumentError naming the offending part when the formula uses anything outside the whitelist
 */
export function compileFormula(expression: string, names: FormulaNames): CompiledFormula {
  checkFormulaText(expression);
  for (const name of [...names.vectors, ...names.scalars]) checkFormulaName(name, "formula variable name");
  const tree = parseFormula(expression);
  try {
    return fromTree(expression, tree, names);
  } catch (error) {
    throw asFormulaError(expression, error);
  }
}

/** Largest derivative tree compiled (nodes); a larger one falls back to numerical differentiation. */
const MAX_DERIVATIVE_NODES = 200_000;
/** Deepest formula tree accepted (levels): deeper recursion would overflow the call stack. */
const MAX_FORMULA_DEPTH = 200;

/**
 * Throws an InvalidArgumentError unless `expression` is a non-empty string of at most
 * MAX_FORMULA_LENGTH characters (checked before any other work).
 * @param expression formula text
 */
export function checkFormulaText(expression: unknown): asserts expression is string {
  if (typeof expression !== "string" || expression.trim() === "") {
    throw new InvalidArgumentError("formula", expression, "a non-empty formula string such as \"a*exp(-b*x)\"");
  }
  if (expression.length > MAX_FORMULA_LENGTH) {
    throw new InvalidArgumentError("formula", `${expression.slice(0, 40)}... (${expression.length} characters)`, `at most ${MAX_FORMULA_LENGTH} characters`);
  }
}

/** Parses with mathjs; a parse failure, a stack overflow or a tree deeper than MAX_FORMULA_DEPTH is an invalid formula. */
function parseFormula(expression: string): MathNode {
  let tree: MathNode;
  try {
    tree = parse(expression);
  } catch (error) {
    if (error instanceof RangeError) throw asFormulaError(expression, error);
    throw new InvalidArgumentError("formula", expression, `it does not parse: ${(error as Error).message}`);
  }
  if (depthOf(tree) > MAX_FORMULA_DEPTH) {
    throw new InvalidArgumentError("formula", expression, `nesting deeper than ${MAX_FORMULA_DEPTH} levels; write it with fewer nested parentheses or functions`);
  }
  return tree;
}

/** Depth of a parse tree, computed without recursion (so a deep tree cannot overflow the stack here). */
function depthOf(tree: MathNode): number {
  let deepest = 0;
  const stack: [MathNode, number][] = [[tree, 1]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop()!;
    if (depth > deepest) deepest = depth;
    if (deepest > MAX_FORMULA_DEPTH) return deepest;
    node.forEach((child: MathNode) => { stack.push([child, depth + 1]); });
  }
  return deepest;
}

/** Node count of a tree (iterative), stopping early past MAX_DERIVATIVE_NODES. */
function countNodes(tree: MathNode): number {
  let count = 0;
  const stack: MathNode[] = [tree];
  while (stack.length > 0 && count <= MAX_DERIVATIVE_NODES) {
    const node = stack.pop()!;
    count++;
    node.forEach((child: MathNode) => { stack.push(child); });
  }
  return count;
}

/** Any failure while compiling becomes an InvalidArgumentError naming the formula (never an internal error). */
function asFormulaError(expression: string, error: unknown): InvalidArgumentError {
  if (error instanceof InvalidArgumentError) return error;
  const why = error instanceof RangeError ? "it is too large or too deeply nested to compile" : `it cannot be compiled (${(error as Error)?.message ?? String(error)})`;
  return new InvalidArgumentError("formula", expression.length > 80 ? `${expression.slice(0, 77)}...` : expression, why);
}

function fromTree(expression: string, tree: MathNode, names: FormulaNames): CompiledFormula {
  const root = compileNode(tree, names, expression);
  const context: Context = { n: 0, vectors: [], scalars: new Float64Array(0) };
  const derivatives = new Map<string, CompiledFormula | null>();
  return {
    expression,
    evaluate(vectors, scalars, out) {
      context.n = out.length; context.vectors = vectors; context.scalars = scalars;
      if (root.scalar) out.fill(root.f(context));
      else out.set(root.f(context));
    },
    derivative(scalarName) {
      if (!names.scalars.includes(scalarName)) {
        throw new InvalidArgumentError("derivative variable", scalarName, `one of ${names.scalars.join(", ")}`);
      }
      if (!derivatives.has(scalarName)) {
        let compiled: CompiledFormula | null = null;
        try {
          // No simplification: mathjs's simplify is exponential on sums of many terms; the
          // unsimplified derivative is a tree a small multiple of the formula's size.
          const d = symbolicDerivative(tree, scalarName, { simplify: false });
          if (countNodes(d) > MAX_DERIVATIVE_NODES) throw new RangeError("derivative too large");
          compiled = fromTree(d.toString(), d, names);
        } catch {
          compiled = null;
        }
        derivatives.set(scalarName, compiled);
      }
      return derivatives.get(scalarName) ?? null;
    },
  };
}

/** Collects the free symbol names of a parsed formula that are not constants or function names. */
export function freeSymbols(expression: string): string[] {
  checkFormulaText(expression);
  const tree = parseFormula(expression);
  const found: string[] = [];
  tree.traverse((node: MathNode, _path: string, parent: MathNode | null) => {
    if (node.type !== "SymbolNode") return;
    const name = (node as unknown as { name: string }).name;
    const isCallee = parent?.type === "FunctionNode" && (parent as unknown as { fn: MathNode }).fn === node;
    if (!isCallee && !(name in CONSTANTS) && !found.includes(name)) found.push(name);
  });
  return found;
}

function reject(expression: string, what: string): never {
  throw new InvalidArgumentError("formula", expression,
    `${what} is not allowed; use numbers, the declared names, + - * / ^ and functions such as exp, log, sqrt, sin, cos, atan`);
}

function compileNode(node: MathNode, names: FormulaNames, expression: string): Compiled {
  const any = node as unknown as Record<string, unknown>;
  switch (node.type) {
    case "ConstantNode": {
      const value = any.value;
      if (typeof value !== "number") reject(expression, `the constant ${JSON.stringify(String(value))}`);
      const v = value as number;
      return { scalar: true, f: () => v };
    }
    case "ParenthesisNode":
      return compileNode(any.content as MathNode, names, expression);
    case "SymbolNode": {
      const name = any.name as string;
      const vectorIndex = names.vectors.indexOf(name);
      if (vectorIndex >= 0) return { scalar: false, f: (c) => c.vectors[vectorIndex] };
      const scalarIndex = names.scalars.indexOf(name);
      if (scalarIndex >= 0) return { scalar: true, f: (c) => c.scalars[scalarIndex] };
      if (Object.prototype.hasOwnProperty.call(CONSTANTS, name)) {
        const v = CONSTANTS[name];
        return { scalar: true, f: () => v };
      }
      return reject(expression, `the unknown name "${name}"`);
    }
    case "OperatorNode": {
      const fn = any.fn as string;
      const args = (any.args as MathNode[]).map((a) => compileNode(a, names, expression));
      if (args.length === 1 && fn === "unaryMinus") return unary((v) => -v, args[0]);
      if (args.length === 1 && fn === "unaryPlus") return args[0];
      const op = BINARY.get(fn);
      if (args.length === 2 && op && ["add", "subtract", "multiply", "divide", "pow"].includes(fn)) return binary(fn, op, args[0], args[1]);
      return reject(expression, `the operator "${String(any.op)}"`);
    }
    case "FunctionNode": {
      const callee = any.fn as MathNode;
      if (callee.type !== "SymbolNode") return reject(expression, "calling a computed function");
      const name = (callee as unknown as { name: string }).name;
      const args = (any.args as MathNode[]).map((a) => compileNode(a, names, expression));
      const u = UNARY.get(name);
      if (u && args.length === 1) return unary(u, args[0]);
      const b = BINARY.get(name);
      if (b && args.length === 2) return binary(name, b, args[0], args[1]);
      return reject(expression, `the function "${name}" with ${args.length} argument(s)`);
    }
    default:
      return reject(expression, `a ${node.type.replace(/Node$/, "").toLowerCase()} expression`);
  }
}

function vectorBuffer(): (n: number) => Float64Array {
  let buffer = new Float64Array(0);
  return (n) => (buffer.length === n ? buffer : (buffer = new Float64Array(n)));
}

function unary(op: (v: number) => number, a: Compiled): Compiled {
  if (a.scalar) { const fa = a.f; return { scalar: true, f: (c) => op(fa(c)) }; }
  const fa = a.f, buffer = vectorBuffer();
  return { scalar: false, f: (c) => {
    const va = fa(c), out = buffer(c.n);
    for (let i = 0; i < c.n; i++) out[i] = op(va[i]);
    return out;
  } };
}

function binary(name: string, op: (a: number, b: number) => number, a: Compiled, b: Compiled): Compiled {
  if (a.scalar && b.scalar) { const fa = a.f, fb = b.f; return { scalar: true, f: (c) => op(fa(c), fb(c)) }; }
  const buffer = vectorBuffer();
  // Specialised loops for the arithmetic operators keep the hot path free of indirect calls.
  if (!a.scalar && !b.scalar) {
    const fa = a.f, fb = b.f;
    return { scalar: false, f: (c) => {
      const va = fa(c), vb = fb(c), out = buffer(c.n), n = c.n;
      switch (name) {
        case "add": for (let i = 0; i < n; i++) out[i] = va[i] + vb[i]; break;
        case "subtract": for (let i = 0; i < n; i++) out[i] = va[i] - vb[i]; break;
        case "multiply": for (let i = 0; i < n; i++) out[i] = va[i] * vb[i]; break;
        case "divide": for (let i = 0; i < n; i++) out[i] = va[i] / vb[i]; break;
        default: for (let i = 0; i < n; i++) out[i] = op(va[i], vb[i]);
      }
      return out;
    } };
  }
  if (a.scalar) {
    const fa = a.f, fb = (b as { f: (c: Context) => Float64Array }).f;
    return { scalar: false, f: (c) => {
      const sa = fa(c), vb = fb(c), out = buffer(c.n), n = c.n;
      switch (name) {
        case "add": for (let i = 0; i < n; i++) out[i] = sa + vb[i]; break;
        case "subtract": for (let i = 0; i < n; i++) out[i] = sa - vb[i]; break;
        case "multiply": for (let i = 0; i < n; i++) out[i] = sa * vb[i]; break;
        case "divide": for (let i = 0; i < n; i++) out[i] = sa / vb[i]; break;
        default: for (let i = 0; i < n; i++) out[i] = op(sa, vb[i]);
      }
      return out;
    } };
  }
  const fa = a.f as (c: Context) => Float64Array, fb = (b as { f: (c: Context) => number }).f;
  return { scalar: false, f: (c) => {
    const va = fa(c), sb = fb(c), out = buffer(c.n), n = c.n;
    switch (name) {
      case "add": for (let i = 0; i < n; i++) out[i] = va[i] + sb; break;
      case "subtract": for (let i = 0; i < n; i++) out[i] = va[i] - sb; break;
      case "multiply": for (let i = 0; i < n; i++) out[i] = va[i] * sb; break;
      case "divide": for (let i = 0; i < n; i++) out[i] = va[i] / sb; break;
      case "pow":
        if (sb === 2) { for (let i = 0; i < n; i++) out[i] = va[i] * va[i]; break; }
        for (let i = 0; i < n; i++) out[i] = Math.pow(va[i], sb); break;
      default: for (let i = 0; i < n; i++) out[i] = op(va[i], sb);
    }
    return out;
  } };
}
