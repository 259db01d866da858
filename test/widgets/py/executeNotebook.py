"""Executes a notebook that creates fringekit widgets on the fringekit kernel with nbclient
(which stores the widget state in the notebook metadata) and writes the executed notebook.
Usage: executeNotebook.py IN.ipynb OUT.ipynb WORKDIR"""
import sys

import nbformat
from nbclient import NotebookClient

source, target, workdir = sys.argv[1:4]
nb = nbformat.read(source, as_version=4)
client = NotebookClient(nb, kernel_name="fringekit", timeout=180, resources={"metadata": {"path": workdir}})
client.execute()
nbformat.write(nb, target)
print("executed", len(nb.cells), "cells")
