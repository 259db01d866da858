/**
 * Serialisers between kernel values and widget state. Numeric arrays travel as binary
 * buffers in the form {dtype, shape, buffer} (little-endian, C order) — common practice in
 * Jupyter widget libraries — instead of JSON number lists.
 */

/** Converts one state value to its wire form and back. */
export interface Serializer<T> {
  serialize(value: T): unknown;
  deserialize(wire: unknown): T;
}

/** Typed arrays that can travel as widget buffers. */
export type TypedArray = Float64Array | Float32Array | Int8Array | Int16Array | Int32Array | Uint8Array | Uint16Array | Uint32Array;

/** dtype names on the wire (NumPy's names, common practice). */
export type DType = "float64" | "float32" | "int8" | "int16" | "int32" | "uint8" | "uint16" | "uint32";

/** An n-dimensional array: flat data in C order plus its shape. */
export interface NdArray {
  data: TypedArray;
  shape: number[];
}

/** Wire form of an array inside widget state; `buffer` becomes a binary frame. */
export interface WireArray {
  dtype: DType;
  shape: number[];
  buffer: DataView;
}

const CONSTRUCTORS: Record<DType, { new (buffer: ArrayBuffer): TypedArray; BYTES_PER_ELEMENT: number }> = {
  float64: Float64Array,
  float32: Float32Array,
  int8: Int8Array,
  int16: Int16Array,
  int32: Int32Array,
  uint8: Uint8Array,
  uint16: Uint16Array,
  uint32: Uint32Array,
};

/** The dtype name of a typed array; throws TypeError for other values. */
export function dtypeOf(array: TypedArray): DType {
  for (const [dtype, ctor] of Object.entries(CONSTRUCTORS)) {
    if (array instanceof (ctor as unknown as new () => TypedArray)) return dtype as DType;
  }
  throw new TypeError(`array: expected a typed array (Float64Array, Int32Array, ...), got ${Object.prototype.toString.call(array)}`);
}

/** {dtype, shape, buffer} of `nd` (no copy: buffer views the array's bytes). */
export function toWireArray(nd: NdArray): WireArray {
  const count = nd.shape.reduce((a, b) => a * b, 1);
  if (!nd.shape.every((n) => Number.isInteger(n) && n >= 0) || count !== nd.data.length) {
    throw new TypeError(`array shape ${JSON.stringify(nd.shape)} does not match its ${nd.data.length} elements`);
  }
  return { dtype: dtypeOf(nd.data), shape: [...nd.shape], buffer: new DataView(nd.data.buffer, nd.data.byteOffset, nd.data.byteLength) };
}

/** Reads {dtype, shape, buffer} into a fresh, aligned typed array. Throws TypeError on bad input. */
export function fromWireArray(wire: unknown): NdArray {
  const w = wire as Partial<WireArray> | null;
  if (w === null || typeof w !== "object") throw new TypeError(`array: expected {dtype, shape, buffer}, got ${String(wire)}`);
  const ctor = typeof w.dtype === "string" ? CONSTRUCTORS[w.dtype as DType] : undefined;
  if (!ctor) throw new TypeError(`array: unknown dtype ${JSON.stringify(w.dtype)} (one of ${Object.keys(CONSTRUCTORS).join(", ")})`);
  const view = w.buffer;
  if (!ArrayBuffer.isView(view)) throw new TypeError("array: buffer is missing (it must arrive as a binary frame)");
  if (view.byteLength % ctor.BYTES_PER_ELEMENT !== 0) {
    throw new TypeError(`array: ${view.byteLength} bytes is not a whole number of ${w.dtype} elements`);
  }
  const copy = new Uint8Array(view.byteLength);
  copy.set(new Uint8Array(view.buffer, view.byteOffset, view.byteLength));
  const data = new ctor(copy.buffer);
  const shape = Array.isArray(w.shape) ? w.shape.map(Number) : [data.length];
  if (shape.reduce((a, b) => a * b, 1) !== data.length) {
    throw new TypeError(`array: shape ${JSON.stringify(shape)} does not match ${data.length} elements`);
  }
  return { data, shape };
}

/** Serialiser for one-dimensional typed arrays (null passes through). */
export const typedArraySerializer: Serializer<TypedArray | null> = {
  serialize: (value) => (value === null ? null : toWireArray({ data: value, shape: [value.length] })),
  deserialize: (wire) => (wire === null || wire === undefined ? null : fromWireArray(wire).data),
};

/** Serialiser for n-dimensional arrays {data, shape} (null passes through). */
export const ndArraySerializer: Serializer<NdArray | null> = {
  serialize: (value) => (value === null ? null : toWireArray(value)),
  deserialize: (wire) => (wire === null || wire === undefined ? null : fromWireArray(wire)),
};
