/**
 * Inflating with a ceiling: the compressed pixel data of a PNG or a Deflate TIFF strip are
 * inflated in small pieces and abandoned as soon as the output passes the size the header
 * implies, so a decompression bomb costs at most that many bytes of work, never its full size.
 * Formats: zlib (RFC 1950) around DEFLATE (RFC 1951); decoder: the npm package fflate.
 */
import { Inflate, Unzlib } from "fflate";

/** Compressed bytes fed per step: at most ~1032 × this (the DEFLATE ratio limit) comes out per step. */
const STEP = 16 * 1024;

/** Thrown (and caught by the caller) when the output passes the ceiling. */
export class InflateLimitExceeded extends Error {
  constructor(readonly limit: number) {
    super(`inflates to more than ${limit} bytes`);
  }
}

/**
 * Number of bytes `data` inflates to, counting without keeping them; throws
 * InflateLimitExceeded as soon as the count passes `limit` (work and memory stay O(limit / 1032 + STEP)).
 * Errors of a corrupt stream are rethrown from the decoder.
 * @param data   compressed bytes
 * @param limit  largest accepted inflated size (bytes)
 * @param format "zlib" (PNG IDAT, TIFF Deflate) or "raw" DEFLATE
 */
export function inflatedSize(data: Uint8Array, limit: number, format: "zlib" | "raw" = "zlib"): number {
  let total = 0;
  const onData = (chunk: Uint8Array): void => {
    total += chunk.length;
    if (total > limit) throw new InflateLimitExceeded(limit);
  };
  const stream = format === "zlib" ? new Unzlib(onData) : new Inflate(onData);
  for (let at = 0; at < data.length; at += STEP) {
    const end = Math.min(at + STEP, data.length);
    stream.push(data.subarray(at, end), end === data.length);
  }
  if (data.length === 0) stream.push(new Uint8Array(0), true);
  return total;
}
