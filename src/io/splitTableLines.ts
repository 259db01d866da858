/**
 * Text table → rows of cells: comment lines, blank lines, delimiter detection and decimal commas.
 */

/** The delimiters fringekit recognises. */
export type Delimiter = "," | ";" | "\t" | "whitespace";

/** One non-comment line split into cells, with its 1-based line number. */
export interface TableRow {
  line: number;
  cells: string[];
}

/** Rows of a table, the comment lines, and the delimiter found. */
export interface SplitTable {
  rows: TableRow[];
  /** Comment lines just before the first row (text without the comment mark), nearest last. */
  leadingComments: string[];
  delimiter: Delimiter;
}

const COMMENT = /^\s*(#|%|\/\/|!)/;

/**
 * Splits a table's text into rows. Lines starting with #, %, // or ! are comments.
 * @param text      the whole file as text
 * @param delimiter force a delimiter; detected from the first rows when omitted
 */
export function splitTableLines(text: string, delimiter?: Delimiter): SplitTable {
  const lines = text.split(/\r\n|\r|\n/);
  const content: { line: number; text: string }[] = [];
  const leadingComments: string[] = [];
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i] as string;
    if (raw.trim() === "") continue;
    if (COMMENT.test(raw)) {
      if (content.length === 0) leadingComments.push(raw.replace(COMMENT, "").trim());
      continue;
    }
    content.push({ line: i + 1, text: raw });
  }
  const chosen = delimiter ?? detectDelimiter(content.slice(0, 50).map((row) => row.text));
  const rows = content.map(({ line, text: rowText }) => ({ line, cells: splitCells(rowText, chosen) }));
  return { rows, leadingComments, delimiter: chosen };
}

/**
 * Picks the delimiter present with the same non-zero count on every sample line (tab, then
 * semicolon, then comma), else one present on at least half the lines; otherwise whitespace.
 * @param sample the first few non-comment lines
 */
export function detectDelimiter(sample: string[]): Delimiter {
  if (sample.length === 0) return ",";
  for (const candidate of ["\t", ";", ","] as const) {
    const counts = sample.map((line) => countOutsideQuotes(line, candidate));
    const first = counts[0] as number;
    if (first > 0 && counts.every((count) => count === first)) return candidate;
  }
  // A few broken rows must not change the delimiter: take one found on most lines.
  for (const candidate of ["\t", ";", ","] as const) {
    const present = sample.filter((line) => countOutsideQuotes(line, candidate) > 0).length;
    if (present >= Math.max(1, sample.length / 2)) return candidate;
  }
  return "whitespace";
}

/**
 * Splits one line into trimmed cells (double quotes group a cell). Empty trailing cells from
 * a trailing delimiter are dropped.
 */
export function splitCells(line: string, delimiter: Delimiter): string[] {
  if (delimiter === "whitespace") return line.trim().split(/\s+/);
  const cells: string[] = [];
  let current = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i] as string;
    if (ch === '"') {
      if (quoted && line[i + 1] === '"') {
        current += '"';
        i++;
      } else quoted = !quoted;
    } else if (ch === delimiter && !quoted) {
      cells.push(current.trim());
      current = "";
    } else current += ch;
  }
  cells.push(current.trim());
  while (cells.length > 1 && cells[cells.length - 1] === "") cells.pop();
  return cells;
}

function countOutsideQuotes(line: string, ch: string): number {
  let count = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    if (line[i] === '"') quoted = !quoted;
    else if (line[i] === ch && !quoted) count++;
  }
  return count;
}
