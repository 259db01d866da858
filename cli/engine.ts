/**
 * The fitting entry points the command calls, looked up at run time so the command builds
 * and its other parts work while the fitter is absent from a build.
 */
import * as fringekit from "../src/index.js";
import type { FitResult, Model, NoiseModelId, Profile } from "../src/index.js";
import { UsageError } from "./usageError.js";

/** The options of fitProfile the command uses. */
export interface CommandFitOptions {
  start?: Record<string, number>;
  fix?: Record<string, number>;
  free?: string[];
  noise?: NoiseModelId | "auto";
  signal?: { aborted: boolean };
}

type FitProfile = (profile: Profile, model: Model, options?: CommandFitOptions) => FitResult;

/** fitProfile of src/fit, or a usage error saying the fitter is not in this build. */
export function fitter(): FitProfile {
  const candidate = (fringekit as unknown as Record<string, unknown>)["fitProfile"];
  if (typeof candidate !== "function") throw new UsageError("this build has no fitter (fitProfile is missing); rebuild fringekit with `npm run build`");
  return candidate as FitProfile;
}
