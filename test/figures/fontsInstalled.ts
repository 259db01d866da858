// Whether the figure fonts (Debian fonts-liberation) are installed, for tests that draw text.
import { figureFonts } from "../../kernel-ext/figures/fonts.js";

/**
 * True when figureFonts() finds Liberation Sans; otherwise warns that `what` is skipped.
 * @param what the tests that need the fonts, as the skip message names them
 */
export function figureFontsInstalled(what: string): boolean {
  try {
    if (figureFonts()) return true;
  } catch {
    // fall through: not installed
  }
  console.warn(`SKIPPED: ${what} (Debian fonts-liberation not installed)`);
  return false;
}
