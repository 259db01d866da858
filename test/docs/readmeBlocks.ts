/**
 * README.md as a test: its fenced code blocks, each with the README line it starts on, and
 * how the docs test runs it.
 *
 * A block is run unless the line just above its fence (blank lines allowed between) is
 *   <!-- readme-test: skip REASON -->
 * with a REASON of at least a few words (shown in the test output). Use it sparingly: for a
 * block that another test already runs, or that cannot run inside a test (it would start the
 * whole suite). A marker without a reason is an error, so a block cannot be silenced quietly.
 */

/** One fenced block of README.md. */
export interface ReadmeBlock {
  /** Info string after the fence: "sh", "ts", or "" for a plain command listing. */
  language: string;
  /** 1-based README line of the opening fence. */
  line: number;
  /** Text of the nearest heading above it ("" before the first heading). */
  section: string;
  /** Lines between the fences, each with its 1-based README line. */
  lines: { text: string; line: number }[];
  /** Why the block is not run, from its marker; undefined when it runs. */
  skip?: string;
}

const MARKER = /^<!--\s*readme-test:\s*(\S+)\s*(.*?)\s*-->$/;

/** The fenced code blocks of a Markdown text (``` fences at column 0, as README.md uses). */
export function readmeBlocks(markdown: string): ReadmeBlock[] {
  const lines = markdown.split("\n");
  const blocks: ReadmeBlock[] = [];
  let section = "";
  for (let i = 0; i < lines.length; i++) {
    const heading = /^#{1,6}\s+(.*)$/.exec(lines[i]!);
    if (heading) section = heading[1]!.trim();
    const fence = /^```(\S*)\s*$/.exec(lines[i]!);
    if (!fence) continue;
    const block: ReadmeBlock = { language: fence[1]!, line: i + 1, section, lines: [] };
    let j = i - 1;
    while (j >= 0 && lines[j]!.trim() === "") j--;
    const marker = j >= 0 ? MARKER.exec(lines[j]!.trim()) : null;
    if (marker) {
      if (marker[1] !== "skip") throw new Error(`README.md:${j + 1}: unknown readme-test marker "${marker[1]}"; only "skip REASON" exists`);
      if (marker[2]!.split(/\s+/).filter(Boolean).length < 3) throw new Error(`README.md:${j + 1}: a readme-test skip marker needs a reason of a few words`);
      block.skip = marker[2];
    }
    for (i = i + 1; i < lines.length && !/^```\s*$/.test(lines[i]!); i++) block.lines.push({ text: lines[i]!, line: i + 1 });
    if (i >= lines.length) throw new Error(`README.md:${block.line}: code block never closed`);
    blocks.push(block);
  }
  return blocks;
}

/**
 * A command line of a usage listing made runnable: `[A]` becomes A, `[A | B]` its last
 * alternative, and the placeholder DIR a folder name inside the test folder.
 */
export function runnableCommand(text: string): string {
  return text
    .replace(/\[([^\][]*)\]/g, (_, inner: string) => inner.split("|").at(-1)!.trim())
    .replace(/\bDIR\b/g, "readme-prefix");
}
