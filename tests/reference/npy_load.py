#!/usr/bin/python3
"""Load a .npy written by saddlekit with numpy and describe it.

stdin:  {"path": "/tmp/x.npy"}
stdout: {"descr", "shape", "fortran_order", "float64_hex", "same_bytes_as_numpy_save"}
where the last tells whether numpy.save of the loaded array writes the very same bytes.
"""
import io
import json
import sys

import numpy as np

req = json.load(sys.stdin)
arr = np.load(req["path"], allow_pickle=False)
buf = io.BytesIO()
np.save(buf, arr)
with open(req["path"], "rb") as fp:
    same = fp.read() == buf.getvalue()
flat = np.ascontiguousarray(arr.astype(np.float64)).ravel()
json.dump({
    "descr": arr.dtype.str,
    "shape": list(arr.shape),
    "fortran_order": bool(np.isfortran(arr)),
    "float64_hex": [format(int(b), "016x") for b in flat.view(np.uint64)],
    "same_bytes_as_numpy_save": same,
}, sys.stdout)
