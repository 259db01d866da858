/** `fringekit profile FRAME [--roi X,Y,W,H] [--dark FILE] [--flat FILE] [--pixel-pitch V U] [--out FILE.csv]`. */
import { basename } from "node:path";
import { formatQuantity, frameToLine, readImage, safeText, sha256Hex } from "../../src/advanced.js";
import { readInputFile, writeOutputFile } from "../files.js";
import { DATA_OPTIONS, profileOptions } from "../loadData.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";

/** Runs the profile command: frame → CSV table (position or pixel, intensity, sigma). */
export async function profileCommand(words: readonly string[]): Promise<CommandOutput> {
  const args = parseArgs(words, { ...DATA_OPTIONS, out: { kind: "value" } }, "profile");
  if (args.positionals.length !== 1) throw new UsageError(`profile needs exactly one frame file (got ${args.positionals.length})`);
  const path = args.positionals[0]!;
  const options = await profileOptions(args, path);
  const bytes = readInputFile(path);
  const stack = readImage(bytes, path);
  const line = frameToLine(stack, { ...options, maskSaturated: true });
  const pitch = options.pixelPitch ?? stack.pixelPitchFromFile;
  const lines: string[] = [
    // The name is quoted: a newline in it would inject rows into the table.
    `# profile of ${safeText(basename(path), 200)} (sha256 ${sha256Hex(bytes)}) made by fringekit profile`,
    pitch === undefined
      ? "# no pixel pitch: positions are pixel indices (give --pixel-pitch VALUE UNIT for millimetres)"
      : `# pixel pitch ${formatQuantity(pitch, 0, "m").text} (${options.pixelPitch !== undefined ? "--pixel-pitch" : "from the file's own resolution record"})`,
    ...line.notes.map((n) => `# ${safeText(n, 500)}`),
    ...line.warnings.map((w) => `# warning: ${safeText(w, 500)}`),
  ];
  let omitted = 0;
  const rows: string[] = [];
  for (let i = 0; i < line.pixel.length; i++) {
    if (line.mask[i] === 0) { omitted++; continue; }
    const position = pitch !== undefined ? String(Number((line.pixel[i]! * pitch * 1e3).toPrecision(10))) : String(line.pixel[i]);
    rows.push(`${position},${Number(line.y[i]!.toPrecision(8))},${Number(line.sigma[i]!.toPrecision(4))}`);
  }
  if (omitted > 0) lines.push(`# ${omitted} masked samples omitted`);
  lines.push(pitch !== undefined ? "position [mm],intensity,sigma" : "pixel,intensity,sigma", ...rows);
  const text = `${lines.join("\n")}\n`;
  const out = args.values.get("out");
  if (out !== undefined) {
    writeOutputFile(out, text, [path, args.values.get("dark") ?? "", args.values.get("flat") ?? ""].filter((p) => p !== ""));
    return { stdout: "", exitCode: 0, stderr: line.warnings.map((w) => `warning: ${w}`) };
  }
  return { stdout: text, exitCode: 0, stderr: line.warnings.map((w) => `warning: ${w}`) };
}
