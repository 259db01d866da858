/** What a command produces: text for stdout, an exit code, and optionally a one-line error. */
export interface CommandOutput {
  stdout: string;
  /**
   * 0 success, 1 fit did not converge (results still written), 2 bad input or usage,
   * 3 the fit converged but a check calls it doubtful (poor-fit, no-fringes, fringe-aliased;
   * results still written; --accept-doubtful turns this into 0).
   */
  exitCode: number;
  /** Printed to stderr as "fringekit: <error>". */
  error?: string;
  /** Extra lines for stderr (warnings). */
  stderr?: string[];
}
