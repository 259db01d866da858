/**
 * The `fringekit` command line: dispatches to a subcommand, prints one-line errors (no stack
 * traces) and returns 0 (success), 1 (fit did not converge, result written) or 2 (bad input/usage).
 */
import { FringekitError, safeText } from "../src/errors.js";
import type { CommandOutput } from "./output.js";
import { USAGE } from "./usage.js";
import { UsageError } from "./usageError.js";

type Command = (words: readonly string[]) => CommandOutput | Promise<CommandOutput>;

// Each command is loaded when it is run, so `fringekit --help` (and every command) loads only
// what it uses instead of the whole library.
const COMMANDS: Record<string, () => Promise<Command>> = {
  models: async () => (await import("./commands/models.js")).modelsCommand,
  fit: async () => (await import("./commands/fit.js")).fitCommand,
  compare: async () => (await import("./commands/compare.js")).compareCommand,
  profile: async () => (await import("./commands/profile.js")).profileCommand,
  batch: async () => (await import("./commands/batch.js")).batchCommand,
  merge: async () => (await import("./commands/merge.js")).mergeCommand,
  kernel: async () => (await import("./commands/kernel.js")).kernelCommand,
  replay: async () => (await import("./commands/replay.js")).replayCommand,
};

/** Where the command writes (the process streams, or a capture in tests). */
export interface CommandStreams {
  stdout(text: string): void;
  stderr(text: string): void;
}

const PROCESS_STREAMS: CommandStreams = {
  stdout: (text) => void process.stdout.write(text),
  stderr: (text) => void process.stderr.write(text),
};

/**
 * Runs the command line and returns the exit code (does not exit, for tests).
 * @param argv words after "fringekit"
 * @param io   output streams
 */
export async function run(argv: readonly string[], io: CommandStreams = PROCESS_STREAMS): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    io.stdout(USAGE);
    return name === undefined ? 2 : 0;
  }
  if (name === "--version") {
    io.stdout("fringekit 0.1.0\n");
    return 0;
  }
  const load = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!load) {
    io.stderr(`fringekit: unknown command "${name}" (commands: ${Object.keys(COMMANDS).join(", ")}); see fringekit --help\n`);
    return 2;
  }
  if (rest.includes("--help") || rest.includes("-h")) {
    io.stdout(USAGE);
    return 0;
  }
  try {
    const command = await load();
    const output = await command(rest);
    if (output.stdout) io.stdout(output.stdout);
    for (const line of output.stderr ?? []) io.stderr(`${safeText(line, 2000)}\n`);
    if (output.error) io.stderr(`fringekit ${name}: ${safeText(output.error, 2000)}\n`);
    return output.exitCode;
  } catch (error) {
    io.stderr(`fringekit ${name}: ${oneLine(error)}\n`);
    return 2;
  }
}

function oneLine(error: unknown): string {
  // One line, no terminal control characters, capped: messages may quote file content.
  const clean = (text: string) => safeText(text.replace(/\s*\n\s*/g, " "), 1000);
  if (error instanceof UsageError) return `${clean(error.message)}; see fringekit --help`;
  if (error instanceof FringekitError) return clean(error.message);
  const text = error instanceof Error ? error.message : String(error);
  return `internal error: ${clean(text)} (please report this with the input file)`;
}
