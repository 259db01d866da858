// Every bad input of the issue, from test/io/corpus (written by make_corpus.py), with the
// one-line message the user sees. Expected texts are this project's own wording.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DataError, readProfile } from "../../src/advanced.js";

const corpus = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`./corpus/${name}`, import.meta.url)));
const load = (name: string, options = {}) => readProfile(corpus(name), { source: name, ...options });

const cases: [string, RegExp][] = [
  ["empty.csv", /^empty\.csv: the file is empty; /],
  ["comments-only.csv", /^comments-only\.csv: only comment lines, no data; /],
  ["header-only.csv", /^header-only\.csv:1: a header row but no data rows; /],
  ["non-numeric.csv", /^non-numeric\.csv:3: a non-numeric cell "abc" in column "intensity"; /],
  ["nan.csv", /^nan\.csv:3: a non-finite value "NaN" \(NaN or infinity\) in column "intensity"; /],
  ["inf.csv", /^inf\.csv:4: a non-finite value "-inf" \(NaN or infinity\)/],
  ["duplicate.csv", /^duplicate\.csv:4: duplicated position 0\.2 in column "position" on lines 3 and 4; remove or average/],
  ["non-monotonic.csv", /^non-monotonic\.csv:4: positions in column "position" are not monotonic: 0\.2 on line 4 after 0\.3 on line 3; sort the rows/],
  ["wrong-unit.csv", /^wrong-unit\.csv: the unit "kg" of column "position" is not a length; use m, mm, um, nm or px/],
  ["short-row.csv", /^short-row\.csv:3: 1 cell where 3 are expected; /],
  ["decimal-comma.csv", /^decimal-comma\.csv:2: 3 cells where 2 are expected; decimal commas\? save the file with ; as separator/],
  ["one-column.csv", /^one-column\.csv: only 1 column found; /],
  ["pixels-no-pitch.csv", /^pixels-no-pitch\.csv: the position column "pixel" holds pixel indices; give the pixel pitch/],
  ["negative-sigma.csv", /^negative-sigma\.csv:3: σ must be positive, found -1/],
  ["binary.dat", /^binary\.dat: binary content \(a zero byte at offset 0\)/],
  ["utf16.csv", /^utf16\.csv: the file is UTF-16 text; save it as UTF-8/],
  ["truncated.png", /^truncated\.png: corrupt or truncated PNG/],
  ["corrupt.png", /^corrupt\.png: corrupt or truncated PNG/],
  ["palette.png", /^palette\.png: indexed-colour \(palette\) PNG is not supported; /],
  ["truncated.tif", /^truncated\.tif: corrupt or truncated TIFF: directory offset \d+ is beyond the end of the file/],
  ["signed.tif", /^signed\.tif: page 1: a 16-bit signed integer image is not supported; /],
  ["loop.tif", /^loop\.tif: corrupt or truncated TIFF: directory chain loops back/],
  ["jpeg.jpg", /^jpeg\.jpg: not a supported file \(a JPEG image/],
  ["bomb-idat.png", /^bomb-idat\.png: the pixel data inflate to more than the 2 bytes the 1 × 1 header implies \(a decompression bomb/],
  ["aliased-strips.tif", /^aliased-strips\.tif: corrupt or truncated TIFF: strip \d+ of page 1 overlaps strip \d+ of page 1/],
  ["long-header.csv", /^long-header\.csv:1: a header cell of 5009 characters, above the limit of 200; /],
  ["escape-cell.csv", /^escape-cell\.csv:3: a non-numeric cell "\\x1b\]0;owned\\x07\\x1b\[2J" in column "intensity"/],
];

describe("readProfile(bad file) gives a one-line DataError naming the file", () => {
  for (const [name, expected] of cases) {
    it(`readProfile(${name})`, () => {
      const before = corpus(name);
      let error: unknown;
      try {
        load(name, name.endsWith(".csv") ? {} : { pixelPitch: 5.5e-6 });
      } catch (caught) {
        error = caught;
      }
      expect(error).toBeInstanceOf(DataError);
      const message = (error as Error).message;
      expect(message).toMatch(expected);
      expect(message).not.toContain("\n");
      expect(corpus(name)).toEqual(before); // the input is never changed
    });
  }
});

describe("readImage(bomb-iccp.png)", () => {
  it("readImage(bomb-iccp.png) decodes the image and never inflates the iCCP chunk", async () => {
    const { readImage } = await import("../../src/index.js");
    const start = performance.now();
    const stack = readImage(corpus("bomb-iccp.png"), "bomb-iccp.png");
    expect([stack.width, stack.height, Array.from(stack.pages[0]!)]).toEqual([4, 2, [1, 2, 3, 4, 5, 6, 7, 8]]);
    expect(performance.now() - start).toBeLessThan(2000);
  });
});

describe("readProfile(frame) without pixel pitch", () => {
  it("readProfile(good16.png) asks for the pixel pitch", () => {
    expect(() => load("good16.png")).toThrow(/good16\.png: a camera frame gives positions in pixels; give the pixel pitch/);
  });
});
