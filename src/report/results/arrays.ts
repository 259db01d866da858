/**
 * Exact JSON encodings for numbers and typed arrays: arrays as little-endian base64
 * ({dtype, shape, base64}, the shape widgets use for binary buffers), non-finite scalars
 * as {"nonFinite": "NaN" | "Infinity" | "-Infinity"}. Every bit survives a round trip.
 */
import { InvalidArgumentError } from "../../errors.js";
import { decodeBase64, encodeBase64 } from "./base64.js";

/** A typed array in JSON: dtype, shape and little-endian bytes as base64. */
export interface EncodedArray {
  dtype: "float64" | "uint8";
  shape: number[];
  base64: string;
}

/** Encode a Float64Array (little-endian) or Uint8Array. */
export function encodeArray(values: Float64Array | Uint8Array): EncodedArray {
  if (values instanceof Uint8Array) return { dtype: "uint8", shape: [values.length], base64: encodeBase64(values) };
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(i * 8, values[i], true);
  return { dtype: "float64", shape: [values.length], base64: encodeBase64(bytes) };
}

/** Decode an EncodedArray of dtype float64; `where` names the field in errors. */
export function decodeFloat64(value: unknown, where: string): Float64Array {
  const bytes = decodeChecked(value, where, "float64");
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out = new Float64Array(bytes.length / 8);
  for (let i = 0; i < out.length; i++) out[i] = view.getFloat64(i * 8, true);
  return out;
}

/** Decode an EncodedArray of dtype uint8. */
export function decodeUint8(value: unknown, where: string): Uint8Array {
  return decodeChecked(value, where, "uint8");
}

function decodeChecked(value: unknown, where: string, dtype: "float64" | "uint8"): Uint8Array {
  const v = value as Partial<EncodedArray> | null;
  if (!v || typeof v !== "object" || v.dtype !== dtype || !Array.isArray(v.shape) || v.shape.length !== 1 || typeof v.base64 !== "string") {
    throw new InvalidArgumentError(where, value, `an encoded ${dtype} array {dtype: "${dtype}", shape: [n], base64}`);
  }
  const bytes = decodeBase64(v.base64, where);
  const size = dtype === "float64" ? 8 : 1;
  if (bytes.length !== v.shape[0] * size) {
    throw new InvalidArgumentError(where, `${bytes.length} bytes`, `${v.shape[0]} ${dtype} values (${v.shape[0] * size} bytes)`);
  }
  return bytes;
}

/** Encode a number (any unit, copied as is) exactly: finite numbers as they are, others as {nonFinite}. */
export function encodeNumber(x: number): number | { nonFinite: string } {
  return Number.isFinite(x) ? x : { nonFinite: String(x) };
}

/** Decode encodeNumber's output; `where` names the field in errors. */
export function decodeNumber(value: unknown, where: string): number {
  if (typeof value === "number") return value;
  const tag = (value as { nonFinite?: unknown } | null)?.nonFinite;
  if (tag === "NaN") return NaN;
  if (tag === "Infinity") return Infinity;
  if (tag === "-Infinity") return -Infinity;
  throw new InvalidArgumentError(where, value, 'a number or {"nonFinite": "NaN" | "Infinity" | "-Infinity"}');
}

/** Deep-encode plain JSON-like data (options): non-finite numbers tagged, functions and undefined dropped. */
export function encodeJson(value: unknown): unknown {
  if (typeof value === "number") return encodeNumber(value);
  if (value === null || typeof value === "string" || typeof value === "boolean") return value;
  if (value instanceof Float64Array || value instanceof Uint8Array) return encodeArray(value);
  if (Array.isArray(value)) return value.map(encodeJson);
  if (typeof value === "object") {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) {
      if (typeof v === "function" || v === undefined || k === "__proto__") continue;
      out[k] = encodeJson(v);
    }
    return out;
  }
  return undefined;
}

/** Inverse of encodeJson. */
export function decodeJson(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(decodeJson);
  if (value && typeof value === "object") {
    const o = value as Record<string, unknown>;
    if (Object.keys(o).length === 1 && "nonFinite" in o) return decodeNumber(o, "value");
    if (o.dtype === "float64" && "base64" in o) return decodeFloat64(o, "array");
    if (o.dtype === "uint8" && "base64" in o) return decodeUint8(o, "array");
    const out: Record<string, unknown> = {};
    // A "__proto__" key in a file would set the object's prototype on assignment: drop it.
    for (const [k, v] of Object.entries(o)) if (k !== "__proto__") out[k] = decodeJson(v);
    return out;
  }
  return value;
}
