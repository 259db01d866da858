"""Execute notebooks headlessly with nbclient and the fringekit kernel.

Usage: python3 run-notebooks.py OUT_DIR NOTEBOOK.ipynb [...]
Each executed notebook is written to OUT_DIR under the same name (written to a temporary
file first, then renamed). Progress goes to stdout, one line per cell. Exit status 1 when a
notebook fails; the partly executed notebook is still written so the failure can be read.
"""
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
        first_line = str(error).strip().splitlines()[-1] if str(error).strip() else "cell failed"
        print(f"  {name}: FAILED: {first_line}", flush=True)
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
    failures = [p for p in argv[2:] if not run(p, out_dir)]
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
