"""Execute one Jupyter notebook under a kernel with nbclient and report what it produced.

Used by `deno task notebook` (scripts/notebook.ts) and by the notebook tests.

Input (JSON on stdin):
  {"notebook": path, "timeout": seconds per cell (default 60), "kernel": name (default
   from the notebook's kernelspec), "out_dir": folder for the executed copy (default: a
   new temporary folder)}
  or {"probe": true} (or the argument --probe, no input) to ask whether nbclient and the
  Deno kernel are installed.

The notebook runs with its own folder as the working directory. Outputs are routed to cells
by their parent message id, also when the kernel publishes them after it reported the cell
idle (the Deno kernel sometimes sends a cell's execute_result late; nbclient alone would drop
it): late outputs go to the cell they belong to, and the last cell gets a short drain.

Output (JSON on stdout):
  {"ok": bool, "error": str, "executed": path of the executed copy, "seconds": float,
   "cells": [{"index", "tags", "mimes": [MIME types of display outputs], "errors":
              [{"ename", "evalue"}], "stdout": str, "stderr": str, "seconds": float}],
   "late_outputs": outputs that arrived after their cell was reported idle,
   "records": {tag-"record" cells: their stdout parsed as one JSON object, merged}}
"""
import json
import os
import sys
import tempfile
import time


def probe(kernel):
    out = {"nbclient": False, "kernel": False, "kernels": []}
    try:
        import nbclient  # noqa: F401
        import nbformat  # noqa: F401
        from jupyter_client.kernelspec import KernelSpecManager
        out["nbclient"] = True
        specs = KernelSpecManager().find_kernel_specs()
        out["kernels"] = sorted(specs)
        out["kernel"] = kernel in specs
    except Exception as e:  # report, do not crash: the caller prints the install hint
        out["error"] = repr(e)
    return out


OUTPUT_TYPES = {"execute_result", "display_data", "update_display_data", "stream", "error",
                "clear_output"}


def routing_client_class():
    """NotebookClient that routes late iopub outputs to the cell they belong to."""
    import asyncio
    import queue

    from nbclient import NotebookClient
    from nbclient.exceptions import CellExecutionComplete
    from nbclient.util import ensure_async

    class RoutingClient(NotebookClient):
        def __init__(self, *args, **kwargs):
            super().__init__(*args, **kwargs)
            self._owners = {}
            self.late_outputs = 0
            self._last_code_index = max(
                (i for i, c in enumerate(self.nb.cells) if c.cell_type == "code"), default=-1)

        def _route_late(self, msg):
            owner = self._owners.get(msg["parent_header"].get("msg_id"))
            if owner is None or msg["msg_type"] not in OUTPUT_TYPES:
                return
            self.late_outputs += 1
            try:
                self.process_message(msg, owner[0], owner[1])
            except CellExecutionComplete:
                pass

        async def _async_poll_output_msg(self, parent_msg_id, cell, cell_index):
            self._owners[parent_msg_id] = (cell, cell_index)
            while True:
                msg = await ensure_async(self.kc.iopub_channel.get_msg(timeout=None))
                if msg["parent_header"].get("msg_id") == parent_msg_id:
                    try:
                        self.process_message(msg, cell, cell_index)
                    except CellExecutionComplete:
                        return
                else:
                    self._route_late(msg)

        async def async_execute_cell(self, cell, cell_index, *args, **kwargs):
            out = await super().async_execute_cell(cell, cell_index, *args, **kwargs)
            if cell_index == self._last_code_index:
                deadline = asyncio.get_event_loop().time() + 1.0
                while asyncio.get_event_loop().time() < deadline:
                    try:
                        msg = await ensure_async(self.kc.iopub_channel.get_msg(timeout=0.1))
                    except (queue.Empty, asyncio.TimeoutError):
                        continue
                    self._route_late(msg)
            return out

    return RoutingClient


def run(req):
    import nbformat
    from nbclient.exceptions import CellExecutionError, CellTimeoutError
    NotebookClient = routing_client_class()

    path = os.path.abspath(req["notebook"])
    nb = nbformat.read(path, as_version=4)
    kernel = req.get("kernel") or nb.metadata.get("kernelspec", {}).get("name", "deno")
    timeout = int(req.get("timeout", 60))
    starts = {}
    ends = {}

    client = NotebookClient(
        nb,
        timeout=timeout,
        kernel_name=kernel,
        allow_errors=False,
        resources={"metadata": {"path": os.path.dirname(path)}},
    )
    client.on_cell_execute = lambda cell, cell_index: starts.__setitem__(cell_index, time.time())
    client.on_cell_executed = lambda cell, cell_index, execute_reply: ends.__setitem__(
        cell_index, time.time())
    error = ""
    t0 = time.time()
    try:
        client.execute()
    except CellTimeoutError as e:
        error = "timeout: " + str(e).strip().splitlines()[0]
    except CellExecutionError as e:
        error = "cell error: " + (str(e).strip().splitlines() or [""])[-1]
    except Exception as e:
        error = f"{type(e).__name__}: {e}"
    seconds = time.time() - t0

    out_dir = req.get("out_dir") or tempfile.mkdtemp(prefix="saddlekit-nb-")
    executed = os.path.join(out_dir, os.path.basename(path))
    nbformat.write(nb, executed)

    cells = []
    records = {}
    for i, cell in enumerate(nb.cells):
        if cell.cell_type != "code":
            continue
        tags = list(cell.get("metadata", {}).get("tags", []))
        mimes, errors, stdout, stderr = [], [], "", ""
        for o in cell.get("outputs", []):
            t = o.get("output_type")
            if t in ("display_data", "execute_result"):
                mimes.extend(sorted(o.get("data", {}).keys()))
            elif t == "error":
                errors.append({"ename": o.get("ename", ""), "evalue": o.get("evalue", "")})
            elif t == "stream":
                if o.get("name") == "stderr":
                    stderr += o.get("text", "")
                else:
                    stdout += o.get("text", "")
        if "record" in tags and stdout.strip():
            try:
                records.update(json.loads(stdout))
            except ValueError as e:
                errors.append({"ename": "RecordError", "evalue": f"record cell {i}: {e}"})
        cells.append({
            "index": i,
            "tags": tags,
            "mimes": mimes,
            "errors": errors,
            "stdout": stdout,
            "stderr": stderr,
            "seconds": (ends[i] - starts[i]) if i in starts and i in ends else None,
            "executed": cell.get("execution_count") is not None,
        })
    return {"ok": not error, "error": error, "executed": executed, "seconds": seconds,
            "late_outputs": client.late_outputs, "cells": cells, "records": records}


def main():
    if "--probe" in sys.argv:
        json.dump(probe("deno"), sys.stdout)
        return
    req = json.load(sys.stdin)
    if req.get("probe"):
        json.dump(probe(req.get("kernel", "deno")), sys.stdout)
    else:
        json.dump(run(req), sys.stdout)


if __name__ == "__main__":
    main()
