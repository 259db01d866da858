/**
 * Position checks: every fit needs strictly increasing x. Repeats and steps backwards are
 * reported with the lines where they happen, so the user can find them in the file.
 */
import { DataError } from "../errors.js";

/**
 * Throws a DataError when positions repeat or go backwards; a fully decreasing column is
 * accepted (the caller reverses it) and reported by returning "decreasing".
 * @param x      positions in file order (any unit)
 * @param lines  1-based file line of each position
 * @param source file name
 * @param column column label for the message
 */
export function checkPositions(x: ArrayLike<number>, lines: ArrayLike<number>, source: string, column: string): "increasing" | "decreasing" {
  const n = x.length;
  if (n < 2) return "increasing";
  const decreasing = (x[1] as number) < (x[0] as number);
  const repeats: number[] = [];
  const backwards: number[] = [];
  for (let i = 1; i < n; i++) {
    const step = (x[i] as number) - (x[i - 1] as number);
    if (step === 0) repeats.push(i);
    else if (decreasing ? step > 0 : step < 0) backwards.push(i);
  }
  if (repeats.length > 0) {
    const i = repeats[0] as number;
    throw new DataError(
      source,
      `duplicated position ${x[i]} in column "${column}" on lines ${lines[i - 1]} and ${lines[i]}${more(repeats.length)}`,
      "remove or average the repeated rows",
      lines[i],
    );
  }
  if (backwards.length > 0) {
    const i = backwards[0] as number;
    throw new DataError(
      source,
      `positions in column "${column}" are not monotonic: ${x[i]} on line ${lines[i]} after ${x[i - 1]} on line ${lines[i - 1]}${more(backwards.length)}`,
      "sort the rows by position, or split the file where a new scan starts",
      lines[i],
    );
  }
  return decreasing ? "decreasing" : "increasing";
}

function more(count: number): string {
  return count > 1 ? ` (and ${count - 1} more place${count > 2 ? "s" : ""})` : "";
}
