/**
 * Progress of a batch on stderr: on a terminal a bar redrawn in place with the rate and the
 * time left; otherwise (a log file, a Slurm job) one plain line every few seconds and a last
 * one with the rate and the time taken.
 */

/** Reports progress; call `step` per finished row and `end` once. */
export interface Progress {
  step(ok: boolean): void;
  end(): void;
}

/** Seconds between plain lines when stderr is not a terminal. */
const LINE_INTERVAL_S = 5;

/**
 * A progress reporter.
 * @param total  rows to do in this run
 * @param label  what is counted ("profiles")
 * @param stream where to write (process.stderr); nothing is written when `quiet`
 * @param quiet  no progress at all
 */
export function progressReporter(total: number, label: string, stream: NodeJS.WriteStream, quiet: boolean): Progress {
  if (quiet || total === 0) return { step: () => {}, end: () => {} };
  const start = performance.now();
  let done = 0;
  let failed = 0;
  let lastLine = start;
  let lastDraw = 0;
  const status = (): string => {
    const seconds = (performance.now() - start) / 1000;
    const rate = done / Math.max(seconds, 1e-3);
    const left = rate > 0 ? (total - done) / rate : Infinity;
    return `${done}/${total} ${label}, ${rate.toFixed(1)}/s, ${done === total ? `took ${duration(seconds)}` : `about ${duration(left)} left`}, ${failed} not fitted`;
  };
  if (stream.isTTY) {
    const draw = (): void => {
      const width = 30;
      const filled = Math.round((done / total) * width);
      stream.write(`\r[${"#".repeat(filled)}${".".repeat(width - filled)}] ${status()}\x1b[K`);
    };
    return {
      step(ok) {
        done++;
        if (!ok) failed++;
        const now = performance.now();
        if (now - lastDraw > 100 || done === total) { lastDraw = now; draw(); }
      },
      end() { if (done > 0) stream.write("\n"); },
    };
  }
  return {
    step(ok) {
      done++;
      if (!ok) failed++;
      const now = performance.now();
      if (now - lastLine >= LINE_INTERVAL_S * 1000) {
        lastLine = now;
        stream.write(`batch: ${status()}\n`);
      }
    },
    end() { if (done > 0) stream.write(`batch: ${status()}\n`); },
  };
}

/** "42 s", "3 min 05 s", "2 h 07 min". */
function duration(seconds: number): string {
  if (!Number.isFinite(seconds)) return "? s";
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, "0")} min`;
}
