/** The help text of `fringekit --help`. */
export const USAGE = `fringekit: fit interference-fringe profiles from the command line

Usage:
  fringekit models [--json]
  fringekit fit FILE [--model ID] [--set NAME=VALUE[UNIT]]... [--fix NAME[=VALUE[UNIT]]]...
                [--noise auto|poisson|gaussian|robust] [--mask-saturated]
                [--pixel-pitch VALUE UNIT] [--max-evaluations N] [--json] [--out FILE]
  fringekit compare FILE --models ID,ID,... [--set ...] [--fix ...] [--noise ...] [--json] [--out FILE]
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
not given); --resume continues an interrupted run; fringekit merge joins the parts.

Exit codes: 0 success; 1 a fit did not converge (the result is still written);
2 bad input or usage. Input files are never changed; outputs are written atomically.

Laser safety: recording fringes involves lasers. Follow your local laser safety rules and the
instructions of your laser safety officer.
`;
