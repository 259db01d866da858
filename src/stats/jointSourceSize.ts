/**
 * Source size from raw fringe profiles taken at several slit separations, fitted jointly with
 * the size and V0 shared (model twoSlitSourceModel, fitter fitJoint), reported like sourceSize.
 */
import { InvalidArgumentError } from "../errors.js";
import { fitJoint, type JointFitResult } from "../fit/fitJoint.js";
import type { FitOptions } from "../fit/types.js";
import type { Profile } from "../profile.js";
import type { Calibration } from "./quantity.js";
import { sourceSize } from "./sourceSize.js";
import { SOURCE_SHAPES, twoSlitSourceModel, type SourceShape } from "../physics/sourceModel.js";

/** One raw profile of a coherence scan and the slit separation (m) it was taken with. */
export interface ScanProfile {
  profile: Profile;
  separation: number;
  /** Starting values for this profile's own parameters (amplitude, center, background, ...). */
  start?: Record<string, number>;
}

/**
 * Joint fit of raw profiles with the source size and V0 shared; returns the joint fit and the
 * size (diameter for "disc", rms size for "gaussian") with its uncertainty and interval.
 * @param scans       ≥ 2 profiles at distinct separations (m)
 * @param shape       "disc" or "gaussian"
 * @param options     fit options for every profile (start must include a size guess, m; fix
 *                    wavelength, distance and sourceDistance at their values)
 * @param calibration wavelength and sourceDistance ± u (m)
 */
export function fitSourceSizeJointly(scans: readonly ScanProfile[], shape: SourceShape, options: FitOptions = {}, calibration: Calibration = {}, level = 0.95):
  { joint: JointFitResult } & ReturnType<typeof sourceSize> {
  if (!Array.isArray(scans) || scans.length < 2) throw new InvalidArgumentError("scans", scans, "at least two profiles at different slit separations");
  if (!(shape in SOURCE_SHAPES)) throw new InvalidArgumentError("shape", shape, '"disc" or "gaussian"');
  const separations = new Set(scans.map((s) => s.separation));
  if (separations.size !== scans.length) throw new InvalidArgumentError("scans", [...scans.map((s) => s.separation)], "distinct slit separations (m)");
  const sizeName = SOURCE_SHAPES[shape];
  const model = twoSlitSourceModel(shape);
  const joint = fitJoint(
    scans.map((scan) => ({ profile: scan.profile, model, fix: { separation: scan.separation }, start: scan.start })),
    [sizeName, "visibility"],
    { autoStart: false, ...options },
  );
  const first = joint.results[0];
  // sourceSize reads the size's covariance from the fit; the joint result carries it, and the
  // interval uses the joint degrees of freedom.
  const asScan = { ...first, modelId: shape === "disc" ? "coherence-disc" : "coherence-gaussian", statistics: joint.statistics, converged: joint.converged };
  return { joint, ...sourceSize(asScan, calibration, level) };
}
