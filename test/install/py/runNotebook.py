"""Executes a notebook on the fringekit kernel with nbclient and writes the executed copy.
Usage: runNotebook.py IN.ipynb OUT.ipynb WORKDIR [--allow-errors]
(WORKDIR: the kernel's working folder; --allow-errors runs every cell even after a failing one,
leaving the errors in the outputs for the caller to report)."""
import sys

import nbformat
from nbclient import NotebookClient

source, target, workdir = sys.argv[1:4]
allow_errors = "--allow-errors" in sys.argv[4:]
nb = nbformat.read(source, as_version=4)
client = NotebookClient(nb, kernel_name="fringekit", timeout=240, resources={"metadata": {"path": workdir}}, allow_errors=allow_errors)
try:
    client.execute()
finally:
    nbformat.write(nb, target)
print("executed", len(nb.cells), "cells")
