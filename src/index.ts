// fringekit: what a notebook needs, on one screen. SI units everywhere (m, rad, counts).
// Solver internals, parsers and figure building blocks: "fringekit/advanced".
// Node-side files (loadProfile, saveResults, loadResults): "fringekit/files"; saveFigure: "fringekit/figures".

// Errors: what went wrong, where, and what to do (fields: what, where, hint).
export { FringekitError, InvalidArgumentError, DataError } from "./errors.js";

// Data: a Profile is x (m), y (counts or a.u.), optional σ and mask, and where it came from.
export type { Profile, Provenance } from "./profile.js";
export { readProfile, type ProfileOptions } from "./io/readProfile.js";
export type { LoadedProfile } from "./io/parseTable.js";
export { readImage } from "./io/readImage.js";
export { coherenceScanProfile } from "./stats/sourceSize.js";
export { simulateProfile, pixelPositions, paramVector, type SimulateOptions, type SimulatedProfile } from "./physics/simulate.js";

// Models: built-in ones by id (listModels), or your own formula in x (m).
export type { Model, ParameterSpec } from "./physics/model.js";
export { getModel, listModels, type ModelOptions, type ModelInfo } from "./physics/registry.js";
export { formulaModel, type FormulaModelOptions } from "./fit/formulaModel.js";

// Fitting: fitProfile(profile, "two-slit", { fix: { wavelength: 680e-9 } }) → Fit
// (fit.params.separation.value / .uncertainty / .unit; fit.interval, band, report, figure, document).
export { fitProfile, type FitProfileOptions } from "./api/fitProfile.js";
export { Fit } from "./api/fit.js";
export type { FitResult, FitParameter, FitOptions, FitWarning, FitStatistics, FitSource, NoiseModelId } from "./fit/types.js";
export { fitJoint, type JointDataset, type JointFitResult } from "./fit/fitJoint.js";
export { propagate, type Propagated, type PropagateOptions } from "./fit/propagate.js";
export type { ProfileInterval } from "./fit/profileInterval.js";
export type { BootstrapOptions, BootstrapSummary } from "./fit/bootstrap.js";

// Comparing models: compare({ ideal: fitA, broadband: fitB }) → .best, .ranking, .verdict, .report(), .figure().
export { compare, Comparison, type FitsToCompare } from "./api/compare.js";
export type { CompareOptions, ModelComparisonRow } from "./stats/comparisonTypes.js";

// Derived quantities, each value ± standard uncertainty (SI) with its unit.
export { derivedQuantities, type DerivedReport, type DerivedOptions } from "./stats/derivedQuantities.js";
export { coherenceLength, degreeOfCoherence } from "./stats/coherence.js";
export { sourceSize } from "./stats/sourceSize.js";
export { fitSourceSizeJointly } from "./stats/jointSourceSize.js";
export { farFieldValidity, type PlannedGeometry } from "./api/farField.js";
export { fringeSpacing, fresnelNumber } from "./physics/formulas.js";
export type { DerivedQuantity, Measured, Calibration } from "./stats/quantity.js";

// Reports and figures: value ± uncertainty text, tables, plotly figure descriptions (FigureSpec).
export { formatQuantity, formatParameter, type FormatOptions, type FormattedQuantity } from "./report/formatQuantity.js";
export { fitReport, comparisonReport, quantityReport, TableReport } from "./report/tableReport.js";
// Figures: fit.figure() and comparison.figure() (builders for anything else: "fringekit/advanced").
export type { FigureSpec } from "./report/figures/figureSpec.js";

// Results files: everything needed to re-run and check a fit; replay says whether it reproduces.
export { parseResults, stringifyResults, type ResultsDocument } from "./report/results/resultsDocument.js";
export { replayResults, type ReplayReport } from "./api/replay.js";
export { parseQuantity } from "./units/parseQuantity.js";
