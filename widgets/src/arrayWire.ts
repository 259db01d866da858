/**
 * Binary array serializers: numeric arrays travel between kernel and browser as
 * `{dtype, shape, buffer}` with the bytes in a widget-message buffer (common practice in
 * the Jupyter widget protocol: buffers are cut out of the JSON state and sent alongside).
 */

/** Element types the wire format carries (little-endian, as every browser and x86/ARM kernel is). */
export type WireDtype = "float64" | "float32" | "int32" | "uint8";

/** An array as it sits in widget state on the wire. */
export interface ArrayWire {
  dtype: WireDtype;
  /** Dimensions, row-major; product equals the element count. */
  shape: number[];
  buffer: DataView | ArrayBuffer | ArrayBufferView;
}

/** A decoded array: flat typed data plus its shape (row-major). */
export interface ShapedArray<T extends Float64Array | Float32Array | Int32Array | Uint8Array = Float64Array> {
  data: T;
  shape: number[];
}

const constructors = {
  float64: Float64Array,
  float32: Float32Array,
  int32: Int32Array,
  uint8: Uint8Array,
} as const;

function dtypeOf(data: ArrayBufferView): WireDtype {
  if (data instanceof Float64Array) return "float64";
  if (data instanceof Float32Array) return "float32";
  if (data instanceof Int32Array) return "int32";
  if (data instanceof Uint8Array) return "uint8";
  throw new TypeError(`invalid array: ${Object.prototype.toString.call(data)} (Float64Array, Float32Array, Int32Array or Uint8Array)`);
}

/**
 * Decode `{dtype, shape, buffer}` into a typed array. Copies only when the bytes are not aligned
 * for the element type (a DataView into a larger message buffer may start at any offset).
 * Returns null for null (an absent optional array).
 */
export function arrayFromWire(wire: ArrayWire | null | undefined): ShapedArray<Float64Array | Float32Array | Int32Array | Uint8Array> | null {
  if (wire === null || wire === undefined) return null;
  const ctor = constructors[wire.dtype];
  if (ctor === undefined) {
    throw new TypeError(`invalid dtype: ${JSON.stringify(wire.dtype)} (float64, float32, int32 or uint8)`);
  }
  const view = wire.buffer;
  const bytes = view instanceof ArrayBuffer ? new Uint8Array(view) : new Uint8Array(view.buffer, view.byteOffset, view.byteLength);
  const count = wire.shape.reduce((a, b) => a * b, 1);
  if (bytes.byteLength !== count * ctor.BYTES_PER_ELEMENT) {
    throw new RangeError(
      `invalid array buffer: ${bytes.byteLength} bytes for shape [${wire.shape.join(", ")}] of ${wire.dtype} ` +
        `(expected ${count * ctor.BYTES_PER_ELEMENT})`,
    );
  }
  const aligned = bytes.byteOffset % ctor.BYTES_PER_ELEMENT === 0;
  const data = aligned
    ? new ctor(bytes.buffer as ArrayBuffer, bytes.byteOffset, count)
    : new ctor(bytes.slice().buffer, 0, count);
  return { data, shape: wire.shape.slice() };
}

/** Encode a typed array (with an optional shape; default 1-D) as `{dtype, shape, buffer}`. */
export function arrayToWire(value: ShapedArray<Float64Array | Float32Array | Int32Array | Uint8Array> | null | undefined): ArrayWire | null {
  if (value === null || value === undefined) return null;
  const { data, shape } = value;
  return {
    dtype: dtypeOf(data),
    shape: shape.slice(),
    buffer: new DataView(data.buffer as ArrayBuffer, data.byteOffset, data.byteLength),
  };
}

/** Serializer pair for widget models' `static serializers`. */
export const arraySerializers = {
  deserialize: (wire: ArrayWire | null) => arrayFromWire(wire),
  serialize: (value: ShapedArray<any> | null) => arrayToWire(value),
};

/** Row `i` of a 2-D float array as a subarray view (no copy). */
export function row(array: ShapedArray<Float64Array | Float32Array | Int32Array | Uint8Array>, i: number): Float64Array {
  const width = array.shape[1] ?? array.data.length;
  const slice = array.data.subarray(i * width, (i + 1) * width);
  return slice instanceof Float64Array ? slice : Float64Array.from(slice);
}
