"""Execute notebooks headlessly with nbclient and the fringekit kernel.

Usage: python3 run-notebooks.py OUT_DIR NOTEBOOK.ipynb [...]
Each executed notebook is written to OUT_DIR under the same name (written to a temporary
file first, then renamed). Two notebooks run at a time (FRINGEKIT_DEMO_JOBS sets how many).
Progress goes to stdout, one line per cell. Exit status 1 when a notebook fails; the partly
executed notebook is still written so the failure can be read.
"""
import multiprocessing
import os
import sys
import time

import nbformat
from nbclient import NotebookClient
from nbclient.exceptions import CellExecutionError


def run(path: str, out_dir: str) -> bool:
    notebook = nbformat.read(path, as_version=4)
    name = os.path.basename(path)
    code_cells = [c for c in notebook.cells if c.cell_type == "code"]
    started = time.monotonic()
    done = {"count": 0}
    print(f"  {name}: starting the fringekit kernel ({len(code_cells)} code cells)", flush=True)

    def on_cell_executed(cell, cell_index, execute_reply):  # nbclient hook
        done["count"] += 1
        status = execute_reply.get("content", {}).get("status", "?")
        print(f"  {name}: cell {done['count']}/{len(code_cells)} {status} "
              f"({time.monotonic() - started:.1f} s)", flush=True)

    client = NotebookClient(
        notebook,
        kernel_name="fringekit",
        timeout=600,
        startup_timeout=120,
        resources={"metadata": {"path": os.path.dirname(os.path.abspath(path))}},
        store_widget_state=True,
        on_cell_executed=on_cell_executed,
    )
    ok = True
    try:
        client.execute()
    except CellExecutionError as error:
        ok = False
        reason = f"{error.ename}: {error.evalue}" if getattr(error, "ename", None) else str(error).strip().splitlines()[-1]
        print(f"  {name}: FAILED in cell {done['count']}/{len(code_cells)}: {reason}", flush=True)
    except Exception as error:  # kernel died, timeout, missing kernelspec: say which notebook
        ok = False
        print(f"  {name}: FAILED: {type(error).__name__}: {error}", flush=True)
    target = os.path.join(out_dir, name)
    temporary = target + ".partial"
    nbformat.write(notebook, temporary)
    os.replace(temporary, target)
    return ok


def main(argv: list[str]) -> int:
    if len(argv) < 3:
        print(__doc__, file=sys.stderr)
        return 2
    out_dir = argv[1]
    os.makedirs(out_dir, exist_ok=True)
    paths = argv[2:]
    # Kernels spend much of their time waiting (start-up, Chromium for figures): run two at once
    # on a 2-core machine; FRINGEKIT_DEMO_JOBS=1 runs them one after the other.
    jobs = max(1, min(len(paths), int(os.environ.get("FRINGEKIT_DEMO_JOBS", "2"))))
    if jobs == 1:
        results = [run(p, out_dir) for p in paths]
    else:
        with multiprocessing.get_context("spawn").Pool(jobs) as pool:
            results = pool.starmap(run, [(p, out_dir) for p in paths])
    return 0 if all(results) else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv))
