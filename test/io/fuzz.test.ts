// Bounded-time fuzzing: random bytes and random mutations of valid corpus files must either
// load or throw a FringekitError, never crash with another error or hang. Seeded, so a failure
// is reproducible; the seed and the mutated input's length are printed on failure.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { FringekitError, readProfile } from "../../src/advanced.js";

const BUDGET_MS = Number(process.env["FRINGEKIT_FUZZ_MS"] ?? 15_000);
const valid = ["good.csv", "good-semicolon.csv", "good16.png", "good8.png", "good-rgb8.png", "good16-le.tif", "good16-be.tif", "good-float.tif", "good-stack.tif"]
  .map((name) => new Uint8Array(readFileSync(new URL(`./corpus/${name}`, import.meta.url))));

/** xorshift32: small seeded generator for reproducible fuzz cases (Marsaglia 2003, J. Stat. Softw. 8(14)). */
function generator(seed: number): () => number {
  let state = seed >>> 0 || 1;
  return () => {
    state ^= state << 13; state >>>= 0;
    state ^= state >>> 17;
    state ^= state << 5; state >>>= 0;
    return state / 4294967296;
  };
}

function mutate(input: Uint8Array, random: () => number): Uint8Array {
  const out = Uint8Array.from(input);
  const kind = Math.floor(random() * 4);
  if (kind === 0) { // flip bytes
    const flips = 1 + Math.floor(random() * 8);
    for (let i = 0; i < flips; i++) out[Math.floor(random() * out.length)] = Math.floor(random() * 256);
    return out;
  }
  if (kind === 1) return out.subarray(0, Math.floor(random() * out.length)); // truncate
  if (kind === 2) { // overwrite a 32-bit field with an extreme value
    const at = Math.floor(random() * Math.max(1, out.length - 4));
    const extreme = [0, 0xffffffff, 0x7fffffff, 0x80000000, 1, out.length][Math.floor(random() * 6)]!;
    new DataView(out.buffer).setUint32(at, extreme >>> 0, random() < 0.5);
    return out;
  }
  const at = Math.floor(random() * out.length); // duplicate a slice
  const length = Math.floor(random() * 64);
  const slice = out.subarray(at, at + length);
  const grown = new Uint8Array(out.length + slice.length);
  grown.set(out.subarray(0, at)); grown.set(slice, at); grown.set(out.subarray(at), at + slice.length);
  return grown;
}

describe("readProfile(fuzzed bytes)", () => {
  it(`readProfile never throws a non-FringekitError (${BUDGET_MS} ms budget)`, () => {
    const random = generator(20261202);
    const end = Date.now() + BUDGET_MS;
    let cases = 0;
    while (Date.now() < end) {
      const input = random() < 0.2
        ? Uint8Array.from({ length: Math.floor(random() * 512) }, () => Math.floor(random() * 256))
        : mutate(valid[Math.floor(random() * valid.length)]!, random);
      try {
        readProfile(input, { source: "fuzz", pixelPitch: 5e-6 });
      } catch (error) {
        if (!(error instanceof FringekitError)) {
          expect.fail(`case ${cases} (${input.length} bytes, first bytes ${Array.from(input.subarray(0, 8))}): ${String(error)}`);
        }
      }
      cases++;
    }
    expect(cases).toBeGreaterThan(50);
  });
});
