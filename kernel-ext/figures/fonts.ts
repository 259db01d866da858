/**
 * The font files figures are drawn and embedded with: Liberation Sans regular and italic
 * (metric-compatible with Arial/Helvetica; SIL Open Font License, which allows embedding),
 * from Debian's fonts-liberation package, or from the folder FRINGEKIT_FONT_DIR names.
 */
import { existsSync } from "node:fs";
import path from "node:path";
import { FringekitError } from "../../src/errors.js";

/** Where Debian (fonts-liberation, fonts-liberation2) and other distributions put the files. */
const FONT_DIRS = [
  "/usr/share/fonts/truetype/liberation",
  "/usr/share/fonts/truetype/liberation2",
  "/usr/share/fonts/liberation-sans",
  "/usr/share/fonts/liberation",
];

/** Absolute paths of the regular and italic faces. */
export interface FigureFonts {
  regular: string;
  italic: string;
}

let found: FigureFonts | undefined;

/**
 * Find Liberation Sans (regular and italic). FRINGEKIT_FONT_DIR, when set, is the only folder looked in.
 * @throws FringekitError "no-font" saying which package to install
 */
export function figureFonts(): FigureFonts {
  if (found) return found;
  const dirs = process.env.FRINGEKIT_FONT_DIR ? [process.env.FRINGEKIT_FONT_DIR] : FONT_DIRS;
  for (const dir of dirs) {
    const regular = path.join(dir, "LiberationSans-Regular.ttf");
    const italic = path.join(dir, "LiberationSans-Italic.ttf");
    if (existsSync(regular) && existsSync(italic)) return (found = { regular, italic });
  }
  throw new FringekitError(
    "no-font",
    `figure export needs the Liberation Sans fonts (LiberationSans-Regular.ttf and -Italic.ttf), looked in ${dirs.join(", ")}; install Debian's fonts-liberation package or set FRINGEKIT_FONT_DIR to a folder holding them`,
  );
}
