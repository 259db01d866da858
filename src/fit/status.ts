/**
 * The one table of solver stop reasons: whether each counts as converged and its message.
 */
import type { StopReason } from "./types.js";

/** Meaning of each stop reason: `converged` says whether the optimum can be trusted. */
export const STOP_REASONS: Readonly<Record<StopReason, { converged: boolean; message: string }>> = {
  "converged-gradient": { converged: true, message: "gradient of the objective is zero to within gtol" },
  "converged-step": { converged: true, message: "relative change of the parameters is below xtol" },
  "converged-objective": { converged: true, message: "relative reduction of the objective is below ftol" },
  "max-evaluations": { converged: false, message: "stopped at the evaluation limit before converging; raise maxEvaluations or give a better start" },
  "cancelled": { converged: false, message: "cancelled by the caller (signal.aborted)" },
  "non-finite": { converged: false, message: "model or objective became non-finite and no finite step could be found; check bounds and start values" },
  "singular": { converged: false, message: "the damped normal equations could not be solved; the Jacobian is singular or non-finite" },
  "invalid-start": { converged: false, message: "residuals are not finite at the starting point; check the start values and the data" },
};

/** Human-readable message for a stop reason. */
export function stopMessage(reason: StopReason): string {
  return STOP_REASONS[reason].message;
}
