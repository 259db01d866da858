/** `fringekit kernel install [--user|--prefix DIR]`: installs the Jupyter kernelspec. */
import { parseArgs } from "../parseArgs.js";
import type { CommandOutput } from "../output.js";
import { UsageError } from "../usageError.js";

/** Runs the kernel command. */
export async function kernelCommand(words: readonly string[]): Promise<CommandOutput> {
  const args = parseArgs(words, { user: { kind: "flag" }, prefix: { kind: "value" } }, "kernel");
  if (args.positionals[0] !== "install" || args.positionals.length !== 1) throw new UsageError('use "fringekit kernel install [--user | --prefix DIR]"');
  const prefix = args.values.get("prefix");
  if (prefix !== undefined && args.flags.has("user")) throw new UsageError("give either --user or --prefix DIR, not both");
  // Loaded only for this command, so other commands start without the kernel extension.
  const { installKernelspec } = await import("../../kernel-ext/install.js");
  const installed = await installKernelspec({ user: args.flags.has("user"), ...(prefix !== undefined ? { prefix } : {}) });
  return { stdout: `installed the Jupyter kernel "fringekit" in ${installed.directory}\n`, exitCode: 0 };
}
