/**
 * A recorded one-dimensional fringe profile, in SI units.
 * Everything downstream (fit, comparison, widgets, reports) takes a Profile.
 */

/** Where a profile came from, so a result can be re-run and checked against its input. */
export interface Provenance {
  /** File name as the user gave it (no directory needed). */
  source: string;
  /** SHA-256 of the file's bytes, lower-case hex. */
  sha256: string;
  /** Options used to turn the file into this profile (column choice, pitch, ROI, ...). */
  options: Record<string, unknown>;
  /** Human-readable notes (e.g. "412 saturated pixels masked at 3.10–3.31 mm"). */
  notes: string[];
}

/** A coded warning met while reading the data (e.g. "saturated-masked"); every fit of the profile repeats it. */
export interface DataWarning {
  code: string;
  message: string;
}

export interface Profile {
  /** Detector positions (m), strictly increasing. */
  x: Float64Array;
  /** Recorded intensity at each position (counts, or arbitrary units). */
  y: Float64Array;
  /** Standard uncertainty of each y (same unit as y), when known. */
  sigma?: Float64Array;
  /** 1 = point used in fits, 0 = excluded (saturated, hot pixel, outside window). Same length as x. */
  mask?: Uint8Array;
  /** Unit of y as read (e.g. "counts", "a.u."). */
  yUnit: string;
  /** True when y are integer detector counts (enables the Poisson noise model by default). */
  counts: boolean;
  provenance?: Provenance;
  /** Coded warnings from reading the data that every fit result carries (e.g. saturated samples masked). */
  warnings?: DataWarning[];
}
