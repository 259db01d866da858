"""nbclient executes a notebook on the fringekit kernel that creates a widget; the widget state
nbclient stores in the notebook metadata must validate against @jupyter-widgets/schema v2
(state.schema.json, view.schema.json), execution counts must be set, and with allow_errors a
cell after a failing cell must still run. Usage: notebook.py STATE_SCHEMA VIEW_SCHEMA WORKDIR"""
import json
import os
import sys

import jsonschema
import nbformat
from nbclient import NotebookClient

from harness import Checks, record_pid

state_schema_path, view_schema_path, workdir = sys.argv[1:4]
checks = Checks()

CELLS = [
    '''import { WidgetModel, typedArraySerializer } from "fringekit/kernel-protocol";
const probe = new WidgetModel(
  { modelName: "ProbeModel", modelModule: "fringekit-probe", modelModuleVersion: "0.1.0",
    viewName: "ProbeView", viewModule: "fringekit-probe", viewModuleVersion: "0.1.0" },
  { label: "fringe", value: 3, x: new Float64Array([0.5, 1.5, 2.5]) as Float64Array | null },
  { serializers: { x: typedArraySerializer } });
probe.display();''',
    'probe.set({ value: 4, x: new Float64Array([1, 2, 3, 4]) });\nprobe.get("value")',
    'throw new RangeError("this cell fails on purpose")',
    'console.log("after the failing cell, value =", probe.get("value"));',
    'probe',
]

nb = nbformat.v4.new_notebook()
nb.cells = [nbformat.v4.new_code_cell(src) for src in CELLS]
nb.metadata["kernelspec"] = {"name": "fringekit", "display_name": "TypeScript (fringekit)", "language": "typescript"}

client = NotebookClient(nb, kernel_name="fringekit", allow_errors=True, timeout=120, resources={"metadata": {"path": workdir}})
try:
    with client.setup_kernel():
        record_pid(client.km)
        for index, cell in enumerate(nb.cells):
            client.execute_cell(cell, index, execution_count=index + 1)
        client.set_widgets_metadata()
except Exception as error:  # report instead of crashing so the test shows what happened
    checks.check("nbclient executes the notebook", False, repr(error))
    checks.report()
    sys.exit(1)

counts = [cell.get("execution_count") for cell in nb.cells]
checks.check("every code cell has an execution count", all(isinstance(c, int) for c in counts), counts)
outputs = [cell.outputs for cell in nb.cells]
errors = [o for o in outputs[2] if o.output_type == "error"]
checks.check("failing cell records an error output with ename and traceback", len(errors) == 1 and errors[0].ename == "RangeError" and errors[0].traceback, outputs[2])
text = "".join(o.get("text", "") for o in outputs[3] if o.output_type == "stream")
checks.check("cell after the failing cell runs (allow_errors)", "after the failing cell, value = 4" in text, outputs[3])

views = [o for o in outputs[0] if o.output_type == "display_data" and "application/vnd.jupyter.widget-view+json" in o.data]
checks.check("widget view is displayed with text fallbacks", len(views) == 1 and "text/plain" in views[0].data and "text/html" in views[0].data, outputs[0])
with open(view_schema_path) as f:
    view_schema = json.load(f)
if views:
    view = views[0].data["application/vnd.jupyter.widget-view+json"]
    try:
        jsonschema.validate(view, view_schema)
        checks.check("widget view data validates against view.schema.json v2", True)
    except jsonschema.ValidationError as error:
        checks.check("widget view data validates against view.schema.json v2", False, error.message)
results = [o for o in outputs[4] if o.output_type == "execute_result"]
checks.check("a model as last expression shows its widget view", len(results) == 1 and "application/vnd.jupyter.widget-view+json" in results[0].data, outputs[4])

widgets = nb.metadata.get("widgets", {}).get("application/vnd.jupyter.widget-state+json")
checks.check("notebook metadata holds widget state", widgets is not None, nb.metadata)
with open(state_schema_path) as f:
    state_schema = json.load(f)
if widgets is not None:
    plain = json.loads(json.dumps(widgets))
    try:
        jsonschema.validate(plain, state_schema)
        checks.check("widget state validates against state.schema.json v2", True)
    except jsonschema.ValidationError as error:
        checks.check("widget state validates against state.schema.json v2", False, error.message)
    models = [m for m in plain["state"].values() if m["model_name"] == "ProbeModel"]
    checks.check("stored state has the model's latest values", len(models) == 1 and models[0]["state"]["value"] == 4 and models[0]["state"]["label"] == "fringe", models)
    if models:
        buffers = models[0].get("buffers", [])
        import base64, struct
        x = [b for b in buffers if b["path"] == ["x", "buffer"]]
        got = struct.unpack("<4d", base64.b64decode(x[0]["data"])) if x and len(base64.b64decode(x[0]["data"])) == 32 else None
        checks.check("binary array stored as a base64 buffer at path x.buffer", got == (1.0, 2.0, 3.0, 4.0), buffers)
        checks.check("array metadata stays in the JSON state", models[0]["state"].get("x", {}).get("dtype") == "float64" and models[0]["state"]["x"].get("shape") == [4], models[0]["state"].get("x"))

checks.report()
