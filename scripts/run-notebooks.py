"""Execute notebooks headlessly with nbclient and the fringekit kernel.

Usage: python3 run-notebooks.py OUT_DIR NOTEBOOK.ipynb [...]
Each executed notebook is written to OUT_DIR under the same name (written to a temporary
file first, then renamed). Two notebooks run at a time (FRINGEKIT_DEMO_JOBS sets how many).
Progress goes to stdout, one line per cell. Exit status 1 when a notebook fails; the partly
executed notebook is still written so the failure can be read.

Kernels are started one at a time (a lock shared by the workers, held until the kernel
answers): jupyter_client picks free ports by binding and releasing them, so two kernels
started at once in two processes can be given the same port. A kernel that dies or does not
answer before its first cell is started once more.
"""
import multiprocessing
import os
import sys
import time

import nbformat
from nbclient import NotebookClient
from nbclient.exceptions import CellExecutionError


_START_LOCK = None


def _share_start_lock(lock) -> None:  # Pool initializer
    global _START_LOCK
    _START_LOCK = lock


class _OneStartAtATime(NotebookClient):
    """Holds the shared start lock from choosing the kernel's ports until the kernel answers."""

    _holds_lock = False

    async def async_start_new_kernel(self, **kwargs):
        if _START_LOCK is not None:
            _START_LOCK.acquire()
            self._holds_lock = True
        try:
            return await super().async_start_new_kernel(**kwargs)
        except BaseException:
            self._release_start_lock()
            raise

    async def async_start_new_kernel_client(self):
        try:
            return await super().async_start_new_kernel_client()
        finally:
            self._release_start_lock()

    def _release_start_lock(self) -> None:
        # Only the holder releases: another worker may hold the lock by now.
        if self._holds_lock:
            self._holds_lock = False
            _START_LOCK.release()


def run(path: str, out_dir: str) -> bool:
    ok = run_once(path, out_dir, last_try=False)
    return ok if ok is not None else bool(run_once(path, out_dir, last_try=True))


def run_once(path: str, out_dir: str, last_try: bool):
    """True/False: the notebook ran/failed; None: its kernel never got to a cell (worth one more try)."""
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

    client = _OneStartAtATime(
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
        if done["count"] == 0 and not last_try:
            print(f"  {name}: the kernel did not start ({type(error).__name__}: {error}); starting it once more", flush=True)
            return None
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
        context = multiprocessing.get_context("spawn")
        with context.Pool(jobs, initializer=_share_start_lock, initargs=(context.Lock(),)) as pool:
            results = pool.starmap(run, [(p, out_dir) for p in paths])
    return 0 if all(results) else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv))
