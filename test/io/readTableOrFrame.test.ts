import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DataError, isImage, isPng, isTiff, readFrameProfile, readProfile, readTableOrFrame, sniffFormat, type FrameProfileReader } from "../../src/advanced.js";

const corpus = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`./corpus/${name}`, import.meta.url)));

/** A frame reader that records its calls and refuses to read (a table must never reach it). */
function watchingReader(): { reader: FrameProfileReader; calls: { source: string; length: number }[] } {
  const calls: { source: string; length: number }[] = [];
  const reader: FrameProfileReader = (bytes, _options, source) => {
    calls.push({ source, length: bytes.length });
    throw new DataError(source, "frame reader called", "test");
  };
  return { reader, calls };
}

describe("readTableOrFrame(bytes, options, readFrame): tables without the image decoders", () => {
  it("readTableOrFrame(good.csv) reads the table as readProfile does and never calls readFrame", () => {
    const { reader, calls } = watchingReader();
    const loaded = readTableOrFrame(corpus("good.csv"), { source: "good.csv" }, reader);
    expect(calls).toEqual([]);
    const reference = readProfile(corpus("good.csv"), { source: "good.csv" });
    expect(Array.from(loaded.profile.x)).toEqual(Array.from(reference.profile.x));
    expect(Array.from(loaded.profile.y)).toEqual(Array.from(reference.profile.y));
    expect(loaded.profile.provenance).toEqual(reference.profile.provenance);
  });

  it("readTableOrFrame(good16.png) hands the bytes to readFrame, named \"frame\" when no source is given", () => {
    const { reader, calls } = watchingReader();
    const bytes = corpus("good16.png");
    expect(() => readTableOrFrame(bytes, {}, reader)).toThrow(/frame reader called/);
    expect(calls).toEqual([{ source: "frame", length: bytes.length }]);
  });

  it("readTableOrFrame(good16-le.tif, …, readFrameProfile) equals readProfile on the same frame", () => {
    const options = { source: "t.tif", pixelPitch: 5.5e-6, tilt: 0 };
    const a = readTableOrFrame(corpus("good16-le.tif"), options, readFrameProfile);
    const b = readProfile(corpus("good16-le.tif"), options);
    expect(Array.from(a.profile.y)).toEqual(Array.from(b.profile.y));
    expect(a.profile.provenance).toEqual(b.profile.provenance);
  });

  it("readTableOrFrame(jpeg.jpg) refuses a JPEG by name before any reader runs", () => {
    const { reader, calls } = watchingReader();
    expect(() => readTableOrFrame(corpus("jpeg.jpg"), { source: "jpeg.jpg" }, reader)).toThrow(/jpeg\.jpg.*JPEG/);
    expect(calls).toEqual([]);
  });
});

describe("isImage(bytes) / isPng / sniffFormat: by the first bytes only", () => {
  // PNG signature: PNG specification (W3C, 2nd edition) §5.2; TIFF headers "II*\0" and "MM\0*":
  // TIFF 6.0 specification §2 (Image File Header); JPEG SOI marker FF D8: ITU-T T.81 Annex B.
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  it.each([
    ["PNG signature", png, true],
    ["PNG signature cut to 7 bytes", png.slice(0, 7), false],
    ["little-endian TIFF II*\\0", [0x49, 0x49, 42, 0], true],
    ["big-endian TIFF MM\\0*", [0x4d, 0x4d, 0, 42], true],
    ["BigTIFF II+\\0 (not read by fringekit)", [0x49, 0x49, 43, 0], false],
    ["JPEG FF D8", [0xff, 0xd8, 0xff, 0xe0], false],
    ["text", Array.from("x,y\n1,2\n", (c) => c.charCodeAt(0)), false],
  ])("isImage(%s) is %s", (_name, bytes, expected) => {
    expect(isImage(new Uint8Array(bytes))).toBe(expected);
  });

  it("isPng, isTiff and sniffFormat agree with the corpus files", () => {
    expect(isPng(corpus("good16.png"))).toBe(true);
    expect(isTiff(corpus("good16-be.tif"))).toBe(true);
    expect(isImage(corpus("good.csv"))).toBe(false);
    expect(sniffFormat(corpus("jpeg.jpg"))).toMatch(/JPEG/);
    expect(sniffFormat(corpus("good.csv"))).toBe("unknown format");
  });
});
