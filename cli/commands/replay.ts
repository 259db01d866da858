/** `fringekit replay RESULT.json [--data FILE] [--dark FILE] [--flat FILE] [--json]`. */
import { existsSync, readFileSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { DataError, decodeText, parseResults, readImage, readOptionsFromRecord, readProfile, replayResults, type Profile } from "../../src/advanced.js";
import { readInputFile } from "../files.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";

/**
 * Re-runs the fits of a results file on its data and says whether they reproduce.
 * The data file is --data, else the recorded file name beside the results file, else the data
 * embedded in the results file. Exit 0 reproduced, 1 not reproduced, 2 bad input.
 */
export function replayCommand(words: readonly string[]): CommandOutput {
  const args = parseArgs(words, { data: { kind: "value" }, dark: { kind: "value" }, flat: { kind: "value" }, json: { kind: "flag" } }, "replay");
  if (args.positionals.length !== 1) throw new UsageError(`replay needs exactly one RESULT.json (got ${args.positionals.length})`);
  const resultsPath = args.positionals[0]!;
  const doc = parseResults(decodeText(readInputFile(resultsPath), resultsPath), resultsPath);
  let dataPath = args.values.get("data");
  if (dataPath === undefined && doc.input.source) {
    const beside = join(dirname(resultsPath), basename(doc.input.source));
    if (existsSync(beside)) dataPath = beside;
  }
  let profile: Profile | null = null;
  if (dataPath !== undefined) {
    const { options, needsDark, needsFlat } = readOptionsFromRecord(doc.input.readOptions, dataPath);
    for (const [needed, option] of [[needsDark, "dark"], [needsFlat, "flat"]] as const) {
      const path = args.values.get(option);
      if (needed && path === undefined) throw new DataError(resultsPath, `the recorded profile used a ${option} frame`, `give it again with --${option} FILE`);
      if (path !== undefined) options[option] = readImage(readFileSync(path), path);
    }
    profile = readProfile(readInputFile(dataPath), options).profile;
  } else if (!doc.input.data) {
    throw new DataError(resultsPath, `the data file ${doc.input.source ?? "(unnamed)"} is not beside the results file and the data are not embedded`, "give the data file with --data FILE");
  }
  const report = replayResults(doc, profile);
  const text = args.flags.has("json")
    ? `${JSON.stringify({ reproduced: report.reproduced, dataCheck: report.dataCheck, differences: report.differences, summary: report.summary }, null, 2)}\n`
    : `${report.summary}\n`;
  return { stdout: text, exitCode: report.reproduced ? 0 : 1 };
}
