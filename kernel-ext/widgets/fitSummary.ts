// The JSON form of a FitResult for widget state (shared with the in-page fitter of static exports).
export { fitSummary } from "../../widgets/shared/fitSummary.js";
