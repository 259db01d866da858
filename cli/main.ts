/** Entry point of the `fringekit` command (loaded by bin/fringekit.js from dist/). */
import { run } from "./run.js";

process.exitCode = await run(process.argv.slice(2));
