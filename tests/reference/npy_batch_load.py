#!/usr/bin/python3
"""Load many .npy / .npz files with numpy in one process and report what numpy reads.

stdin:  {"files": [{"path": "/tmp/a.npy"} | {"path": "/tmp/b.npz", "array": "a"}, ...]}
stdout: {"results": [{"ok": true, "shape": [...], "float64_hex": [...]} |
                     {"ok": false, "error": "ValueError: ..."}, ...]}

Each file is read the way a user would: numpy.load(path, allow_pickle=False), then the
named member for an archive, converted to float64 (bool to 0/1). Any exception is a
refusal; the error text is for messages only.
"""
import json
import sys
import warnings

import numpy as np

warnings.simplefilter("ignore")
req = json.load(sys.stdin)
results = []
for f in req["files"]:
    try:
        if "array" in f:
            with np.load(f["path"], allow_pickle=False) as z:
                arr = z[f["array"]]
        else:
            arr = np.load(f["path"], allow_pickle=False)
        flat = np.ascontiguousarray(np.asarray(arr).astype(np.float64)).ravel()
        results.append({
            "ok": True,
            "shape": list(arr.shape),
            "float64_hex": [format(int(b), "016x") for b in flat.view(np.uint64)],
        })
    except Exception as e:  # noqa: BLE001 - any refusal counts
        results.append({"ok": False, "error": f"{type(e).__name__}: {e}"[:200]})
json.dump({"results": results}, sys.stdout)
