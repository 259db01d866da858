/** `fringekit replay RESULT.json [--data FILE]`: re-runs a saved result on its data. */
import * as fringekit from "../../src/index.js";
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";

/** Runs the replay command when the report module provides replay; otherwise says it is missing. */
export function replayCommand(words: readonly string[]): CommandOutput {
  const args = parseArgs(words, { data: { kind: "value" }, json: { kind: "flag" } }, "replay");
  if (args.positionals.length !== 1) throw new UsageError(`replay needs exactly one RESULT.json (got ${args.positionals.length})`);
  const replay = (fringekit as unknown as Record<string, unknown>)["replayResult"];
  if (typeof replay !== "function") throw new UsageError("replay is not available in this build (the results-file reader is not part of it yet)");
  throw new UsageError("replay is not wired to the results-file reader yet");
}
