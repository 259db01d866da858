/** The help text of `fringekit --help`. */
export const USAGE = `fringekit: fit interference-fringe profiles from the command line

Usage:
  fringekit models [--json]
  fringekit fit FILE [--model ID] [--set NAME=VALUE[UNIT]]... [--fix NAME[=VALUE[UNIT]]]...
                [--noise auto|poisson|gaussian|robust] [--keep-saturated]
                [--pixel-pitch VALUE UNIT] [--max-evaluations N] [--accept-doubtful]
                [--json] [--out FILE]
  fringekit compare FILE --models ID,ID,... [--set ...] [--fix ...] [--noise ...]
                [--accept-doubtful] [--json] [--out FILE]
  fringekit profile FRAME [--roi X,Y,WIDTH,HEIGHT] [--dark FILE] [--flat FILE]
                [--pixel-pitch VALUE UNIT] [--tilt auto|ANGLE] [--page N|mean] [--out FILE.csv]
  fringekit batch FILES|FOLDERS... [--list PATHS.txt] [--model ID] [--jobs N] [--page each]
                [--shard I/N] [--resume] [--quiet] --out results.csv|results.json
  fringekit batch FILES|FOLDERS... [options] --slurm-script job.sh --tasks N --out parts/results.csv
  fringekit merge PARTS...|FOLDER --out results.csv|results.json
  fringekit kernel install [--user | --prefix DIR]
  fringekit replay RESULT.json [--data FILE]

Data files: text tables (CSV, TSV, semicolon- or space-separated; units in the header such as
"position [mm]" and "intensity (counts)"), or PNG/TIFF camera frames (give --pixel-pitch unless
the PNG records its pixel size).
Column choice: --x COL --y COL --sigma COL|none (name or number, 1 = first), --x-unit UNIT.
Values take units with or without a space: 532nm, 532 nm, 0.85m, 5.5 um.
The default model is two-slit; "fringekit models" lists the models and their parameters.

Batch: --list names a file with one data path per line; --page each fits every page of a TIFF
stack; --shard I/N fits inputs I, I+N, I+2N, ... (counted from 1) into a part file
(results.part-I-of-N.jsonl; inside a Slurm array job the task's shard is used when --shard is
not given); --resume continues an interrupted run; fringekit merge joins the parts. A row
whose fit converged but is doubtful has status "doubtful" (exit 3 unless --accept-doubtful).
Saturated samples (at a detector top code such as 4095) are masked in tables and frames;
--keep-saturated keeps them (--mask-saturated, the default, is still accepted).
Checks on every fit: a χ² goodness-of-fit test when the noise scale is known (Poisson counts or a
σ column): poor when p < 0.001 and χ²/ν > 1.5; fringe detection (periodogram power at the
fitted fringe frequency against the local noise floor, false-alarm probability < 0.001); the
fitted fringe period must exceed two samples; wavelength, distance, slits or source distance
not given are reported; implausible lengths (wavelength 532 m) are refused.

Exit codes: 0 success; 1 a fit did not converge (the result is still written);
2 bad input or usage; 3 the fit converged but a check calls it doubtful (poor fit, no
significant fringe, or fringe period below two samples; the result is still written):
--accept-doubtful exits with 0 instead. Input files are never changed; outputs are written
atomically.

Laser safety: recording fringes involves lasers. Follow your local laser safety rules and the
instructions of your laser safety officer.
`;
