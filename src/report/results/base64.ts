/** Base64 (RFC 4648 §4) for typed-array payloads in results files; pure, no Buffer/atob. */
import { InvalidArgumentError } from "../../errors.js";

const ALPHABET = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/";
const LOOKUP = new Int16Array(128).fill(-1);
for (let i = 0; i < ALPHABET.length; i++) LOOKUP[ALPHABET.charCodeAt(i)] = i;

/** Encode bytes as base64 with "=" padding. */
export function encodeBase64(bytes: Uint8Array): string {
  let out = "";
  for (let i = 0; i < bytes.length; i += 3) {
    const a = bytes[i], b = bytes[i + 1] ?? 0, c = bytes[i + 2] ?? 0;
    const n = (a << 16) | (b << 8) | c;
    out += ALPHABET[(n >> 18) & 63] + ALPHABET[(n >> 12) & 63];
    out += i + 1 < bytes.length ? ALPHABET[(n >> 6) & 63] : "=";
    out += i + 2 < bytes.length ? ALPHABET[n & 63] : "=";
  }
  return out;
}

/** Decode padded base64; throws InvalidArgumentError naming `where` on any bad character or length. */
export function decodeBase64(text: string, where = "base64 data"): Uint8Array {
  if (typeof text !== "string" || text.length % 4 !== 0) {
    throw new InvalidArgumentError(where, typeof text === "string" ? `${text.length} characters` : typeof text, "base64 text whose length is a multiple of 4");
  }
  const padding = text.endsWith("==") ? 2 : text.endsWith("=") ? 1 : 0;
  const out = new Uint8Array((text.length / 4) * 3 - padding);
  let o = 0;
  for (let i = 0; i < text.length; i += 4) {
    let n = 0;
    for (let j = 0; j < 4; j++) {
      const ch = text.charCodeAt(i + j);
      const isPad = ch === 61 && i + j >= text.length - padding;
      const v = isPad ? 0 : ch < 128 ? LOOKUP[ch] : -1;
      if (v < 0) throw new InvalidArgumentError(where, `character ${JSON.stringify(text[i + j])} at ${i + j}`, "base64 text (A–Z, a–z, 0–9, +, /, = padding)");
      n = (n << 6) | v;
    }
    if (o < out.length) out[o++] = (n >> 16) & 255;
    if (o < out.length) out[o++] = (n >> 8) & 255;
    if (o < out.length) out[o++] = n & 255;
  }
  return out;
}
