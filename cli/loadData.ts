/**
 * Options shared by the commands that read data, and the loading itself.
 */
import { createHash } from "node:crypto";
import { basename } from "node:path";
import { isImage, parseQuantity, readTableOrFrame, type FrameProfileReader, type ImageStack, type LoadedProfile, type ProfileOptions, type RegionOfInterest } from "../src/advanced.js";
import { readInputFile } from "./files.js";
import type { OptionSpec, ParsedArgs } from "./parseArgs.js";
import { UsageError } from "./usageError.js";

/** Options of every command that reads a profile. */
export const DATA_OPTIONS: Record<string, OptionSpec> = {
  "pixel-pitch": { kind: "value", unitWord: true },
  "mask-saturated": { kind: "flag" },
  "keep-saturated": { kind: "flag" },
  x: { kind: "value" },
  y: { kind: "value" },
  sigma: { kind: "value" },
  "x-unit": { kind: "value" },
  roi: { kind: "value" },
  dark: { kind: "value" },
  flat: { kind: "value" },
  tilt: { kind: "value", unitWord: true },
  page: { kind: "value" },
};

/**
 * Turns the data options into ProfileOptions (SI), reading dark and flat frames.
 * @param args parsed command line
 * @param source name of the data file (for messages)
 */
export async function profileOptions(args: ParsedArgs, source: string): Promise<ProfileOptions> {
  const options: ProfileOptions = { source };
  const pitch = args.values.get("pixel-pitch");
  if (pitch !== undefined) {
    const value = parseQuantity(pitch, "length", "--pixel-pitch").value;
    if (!(value > 0)) throw new UsageError(`invalid --pixel-pitch: "${pitch}" (a positive length, e.g. 5.5 um)`);
    options.pixelPitch = value;
  }
  // Saturated samples are masked by default (tables and frames); --mask-saturated stays accepted.
  if (args.flags.has("keep-saturated") && args.flags.has("mask-saturated")) throw new UsageError("--keep-saturated and --mask-saturated contradict each other; give one");
  if (args.flags.has("keep-saturated")) options.maskSaturated = false;
  else if (args.flags.has("mask-saturated")) options.maskSaturated = true;
  const x = args.values.get("x"), y = args.values.get("y"), sigma = args.values.get("sigma");
  if (x !== undefined) options.x = x;
  if (y !== undefined) options.y = y;
  if (sigma !== undefined) options.sigma = sigma === "none" ? false : sigma;
  const xUnit = args.values.get("x-unit");
  if (xUnit !== undefined) options.xUnit = xUnit;
  const roi = args.values.get("roi");
  if (roi !== undefined) options.roi = parseRoi(roi);
  const tilt = args.values.get("tilt");
  if (tilt !== undefined) options.tilt = tilt === "auto" ? "auto" : parseQuantity(tilt, "angle", "--tilt", "deg").value;
  const page = args.values.get("page");
  if (page !== undefined) {
    if (page !== "mean" && !/^\d+$/.test(page)) throw new UsageError(`invalid --page: "${page}" (a page number from 1, or "mean")`);
    options.page = page === "mean" ? "mean" : Number(page);
  }
  const dark = args.values.get("dark");
  if (dark !== undefined) options.dark = await readFrame(dark);
  const flat = args.values.get("flat");
  if (flat !== undefined) options.flat = await readFrame(flat);
  return options;
}

/** "X,Y,WIDTH,HEIGHT" in pixels → RegionOfInterest. */
export function parseRoi(text: string): RegionOfInterest {
  const parts = text.split(",").map((p) => p.trim());
  if (parts.length !== 4 || parts.some((p) => !/^\d+$/.test(p))) throw new UsageError(`invalid --roi: "${text}" (X,Y,WIDTH,HEIGHT in whole pixels, e.g. 0,900,2048,200)`);
  const [x, y, width, height] = parts.map(Number) as [number, number, number, number];
  return { x, y, width, height };
}

// The image decoders (fast-png, fflate, utif2) are loaded only when an image is read: a table
// fit does not pay for them at command start (benchmark B9).
async function readFrame(path: string): Promise<ImageStack> {
  const bytes = readInputFile(path);
  const { readImage } = await import("../src/io/readImage.js");
  return readImage(bytes, path);
}

async function frameReader(): Promise<FrameProfileReader> {
  return (await import("../src/io/readFrameProfile.js")).readFrameProfile;
}

const NO_FRAME_READER: FrameProfileReader = () => {
  throw new Error("frame reader not loaded for an image"); // unreachable: images get frameReader()
};

/**
 * Reads a data file (table or frame) into a profile, as readProfile does. A table's SHA-256
 * (provenance) is computed by Node's crypto, the same digest as the library's own sha256Hex.
 * @param path file path
 * @param args parsed command line with the data options
 */
export async function loadData(path: string, args: ParsedArgs): Promise<LoadedProfile> {
  const bytes = readInputFile(path);
  const options = await profileOptions(args, path);
  const image = isImage(bytes);
  if (!image) options.sha256 = createHash("sha256").update(bytes).digest("hex");
  const loaded = readTableOrFrame(bytes, options, image ? await frameReader() : NO_FRAME_READER);
  const provenance = loaded.profile.provenance;
  if (provenance) {
    provenance.source = basename(path);
    // Name the dark and flat files (the library records only that they were used).
    for (const option of ["dark", "flat"] as const) {
      const file = args.values.get(option);
      if (file !== undefined) provenance.options[option] = basename(file);
    }
  }
  return loaded;
}
