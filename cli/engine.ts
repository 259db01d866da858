/**
 * The fitting options the command builds (a subset of src/fit's FitOptions).
 */
import type { FitOptions } from "../src/advanced.js";

/** The options of fitProfile the command sets from --set, --fix, --noise and --max-evaluations. */
export type CommandFitOptions = Pick<FitOptions, "start" | "fix" | "noise" | "maxEvaluations">;
