// The browser's array serializers against the kernel side's (kernel-ext/widget/serializers):
// both ends of the wire must agree on {dtype, shape, buffer}.
import { describe, expect, it } from "vitest";
import { fromWireArray, toWireArray } from "../../kernel-ext/widget/serializers.js";
import { arrayFromWire, arrayToWire, row } from "../../widgets/src/arrayWire.js";

describe("arrayWire", () => {
  it("arrayFromWire(kernel toWireArray(x)) returns x with its dtype and shape", () => {
    const data = Float64Array.from({ length: 12 }, (_, i) => Math.sin(i) * 1e-3);
    const decoded = arrayFromWire(toWireArray({ data, shape: [3, 4] }) as never)!;
    expect(decoded.data).toBeInstanceOf(Float64Array);
    expect(Array.from(decoded.data)).toEqual(Array.from(data));
    expect(decoded.shape).toEqual([3, 4]);
    expect(Array.from(row(decoded as never, 1))).toEqual(Array.from(data.subarray(4, 8)));
  });

  it("kernel fromWireArray(arrayToWire(mask)) returns the same bytes", () => {
    const mask = Uint8Array.from([1, 0, 1, 1, 0]);
    const back = fromWireArray(arrayToWire({ data: mask, shape: [5] }));
    expect(back.data).toBeInstanceOf(Uint8Array);
    expect(Array.from(back.data)).toEqual([1, 0, 1, 1, 0]);
  });

  it("arrayFromWire(view at an odd offset) copies to an aligned array", () => {
    const bytes = new Uint8Array(1 + 16);
    new DataView(bytes.buffer).setFloat64(1, 2.5, true);
    new DataView(bytes.buffer).setFloat64(9, -7.25, true);
    const decoded = arrayFromWire({ dtype: "float64", shape: [2], buffer: new DataView(bytes.buffer, 1, 16) })!;
    expect(Array.from(decoded.data)).toEqual([2.5, -7.25]);
  });

  it("arrayFromWire(wrong byte count) names the shape and the expected size", () => {
    expect(() => arrayFromWire({ dtype: "float64", shape: [3], buffer: new ArrayBuffer(16) })).toThrow(/16 bytes for shape \[3\] of float64 \(expected 24\)/);
    expect(() => arrayFromWire({ dtype: "complex" as never, shape: [1], buffer: new ArrayBuffer(8) })).toThrow(/invalid dtype/);
    expect(arrayFromWire(null)).toBeNull();
  });
});
