/**
 * A short fingerprint of the data a fit used, so comparisons can refuse fits to different data.
 * Method: FNV-1a (Fowler, Noll, Vo; public-domain hash, 32-bit parameters) run in two lanes
 * with different offset bases over the little-endian bytes of x, y, σ and the effective mask.
 */
import type { Profile } from "../profile.js";

const FNV_PRIME = 16777619;
const OFFSET_A = 2166136261; // standard FNV-1a 32-bit offset basis
const OFFSET_B = 0x9e3779b9; // second lane: golden-ratio constant (common practice)

class Fnv64 {
  private a = OFFSET_A;
  private b = OFFSET_B;
  bytes(data: Uint8Array): void {
    let a = this.a;
    let b = this.b;
    for (let i = 0; i < data.length; i++) {
      a = Math.imul(a ^ data[i], FNV_PRIME);
      b = Math.imul(b ^ data[i], FNV_PRIME);
    }
    this.a = a;
    this.b = b;
  }
  floats(values: Float64Array): void {
    const view = new DataView(new ArrayBuffer(8));
    const eight = new Uint8Array(view.buffer);
    for (let i = 0; i < values.length; i++) {
      view.setFloat64(0, values[i], true);
      this.bytes(eight);
    }
  }
  hex(): string {
    return (this.a >>> 0).toString(16).padStart(8, "0") + (this.b >>> 0).toString(16).padStart(8, "0");
  }
}

/**
 * 16-hex-digit fingerprint of a profile's x (m), y, σ and mask. A missing mask counts as
 * "all points used" and a missing σ as "no σ", so equal data always hash equal.
 * @example profileFingerprint(profile) // "3f9a0c1e77b2d410"
 */
export function profileFingerprint(profile: Profile): string {
  const hash = new Fnv64();
  hash.bytes(new Uint8Array([profile.x.length & 255, (profile.x.length >>> 8) & 255, (profile.x.length >>> 16) & 255]));
  hash.floats(profile.x);
  hash.floats(profile.y);
  hash.bytes(new Uint8Array([profile.sigma ? 1 : 0]));
  if (profile.sigma) hash.floats(profile.sigma);
  const mask = new Uint8Array(profile.x.length);
  for (let i = 0; i < mask.length; i++) mask[i] = profile.mask ? (profile.mask[i] ? 1 : 0) : 1;
  hash.bytes(mask);
  return hash.hex();
}
