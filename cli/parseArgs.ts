/**
 * A small command-line parser: long options with a value (`--model two-slit`, `--model=two-slit`),
 * repeatable options (`--set a=1 --set b=2`), flags (`--json`), and positional arguments.
 * `--pixel-pitch 5.5 um` takes its unit as a second word when the value is a bare number.
 */
import { UsageError } from "./usageError.js";

/** What an option takes. */
export interface OptionSpec {
  kind: "flag" | "value" | "list";
  /** Accept a unit as a separate word after a bare number ("--pixel-pitch 5.5 um"). */
  unitWord?: boolean;
}

/** Parsed command line. */
export interface ParsedArgs {
  positionals: string[];
  flags: Set<string>;
  values: Map<string, string>;
  lists: Map<string, string[]>;
}

/**
 * Parses argv words against the options a command accepts.
 * @param words   the words after the command name
 * @param options option name (without "--") → spec
 * @param command command name for messages
 * @throws UsageError for an unknown option or a missing value
 */
export function parseArgs(words: readonly string[], options: Record<string, OptionSpec>, command: string): ParsedArgs {
  const parsed: ParsedArgs = { positionals: [], flags: new Set(), values: new Map(), lists: new Map() };
  for (let i = 0; i < words.length; i++) {
    const word = words[i]!;
    if (word === "--") {
      parsed.positionals.push(...words.slice(i + 1));
      break;
    }
    if (!word.startsWith("--") || word === "-") {
      if (word.startsWith("-") && word.length > 1 && !/^-\d/.test(word)) throw new UsageError(`unknown option ${word} for "fringekit ${command}"`);
      parsed.positionals.push(word);
      continue;
    }
    const eq = word.indexOf("=");
    const name = word.slice(2, eq >= 0 ? eq : undefined);
    const spec = Object.hasOwn(options, name) ? options[name] : undefined;
    if (!spec) {
      const known = Object.keys(options).map((o) => `--${o}`).join(", ");
      throw new UsageError(`unknown option --${name} for "fringekit ${command}" (options: ${known})`);
    }
    if (spec.kind === "flag") {
      if (eq >= 0) throw new UsageError(`option --${name} takes no value`);
      parsed.flags.add(name);
      continue;
    }
    let value: string;
    if (eq >= 0) value = word.slice(eq + 1);
    else {
      const next = words[i + 1];
      if (next === undefined || (next.startsWith("--") && next.length > 2)) throw new UsageError(`option --${name} needs a value`);
      value = next;
      i++;
      const unit = words[i + 1];
      if (spec.unitWord && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(value) && unit !== undefined && /^[A-Za-zµμ]+$/.test(unit)) {
        value = `${value} ${unit}`;
        i++;
      }
    }
    if (spec.kind === "list") parsed.lists.set(name, [...(parsed.lists.get(name) ?? []), value]);
    else {
      if (parsed.values.has(name)) throw new UsageError(`option --${name} given twice`);
      parsed.values.set(name, value);
    }
  }
  return parsed;
}
