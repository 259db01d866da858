// Child process for the bomb tests: decodes one file with readImage and prints
// {message, ms, maxRssMiB} as JSON, so the parent can bound time and peak memory.
import { readFileSync } from "node:fs";
import { readImage } from "../../src/index.js";

const file = process.argv[2]!;
const bytes = new Uint8Array(readFileSync(file));
const start = performance.now();
let message = "accepted";
try {
  readImage(bytes, "bomb");
} catch (error) {
  message = (error as Error).message;
}
const ms = performance.now() - start;
console.log(JSON.stringify({ message, ms, maxRssMiB: process.resourceUsage().maxRSS / 1024 }));
