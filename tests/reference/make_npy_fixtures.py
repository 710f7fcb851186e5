#!/usr/bin/python3
"""Write the .npy/.npz fixtures of tests/samples/npy_fixtures_test.ts with Debian's numpy.

Run with Debian's interpreter (python3-numpy):

    /usr/bin/python3 tests/reference/make_npy_fixtures.py [OUT_DIR]

OUT_DIR defaults to tests/fixtures/npy. Besides the arrays it writes expected.json: for every
file, the dtype, order, version and shape, and the values numpy itself gives after
`numpy.asarray(arr, dtype=numpy.float64)` in C order, as hex of the float64 bits, so the
reader can be compared bit for bit. The content is deterministic (no randomness, no
timestamps in .npy; .npz zip entries carry numpy's fixed date), so rerunning reproduces it.
"""
import json
import os
import sys

import numpy as np
from numpy.lib import format as npf

OUT = sys.argv[1] if len(sys.argv) > 1 else os.path.join(
    os.path.dirname(os.path.abspath(__file__)), "..", "fixtures", "npy")
os.makedirs(OUT, exist_ok=True)


def values_for(kind, size):
    """12 values exercising each type's edges (4 x 3 when 2-D)."""
    if kind == "f":
        info = np.finfo(f"f{size}")
        tiny_sub = float(info.smallest_subnormal) if hasattr(info, "smallest_subnormal") else 0.0
        return [0.0, -0.0, 1.0, -2.5, 1.0 / 3.0, float(info.max), -float(info.max),
                float(info.tiny), tiny_sub, 0.1, 1e-3, 123.456]
    if kind == "b":
        return [True, False, True, True, False, False, True, False, True, False, False, True]
    info = np.iinfo(f"{kind}{size}")
    lo, hi = int(info.min), int(info.max)
    vals = [0, 1, hi, lo, hi - 1, lo + 1, 7, 2, 3, 5, 11, 13]
    if kind == "i":
        vals[6] = -7
    if size == 8:
        # Beyond 2^53: the float64 values are numpy's rounding of these integers.
        vals[7] = 2**53 + 1
        vals[8] = 2**53 + 3
        vals[9] = 2**62 + 2**10 + 1
    return vals


def hexbits(a):
    flat = np.ascontiguousarray(np.asarray(a, dtype=np.float64)).ravel(order="C")
    return [format(int(b), "016x") for b in flat.view(np.uint64)]


expected = []


def save(name, arr, version=None):
    path = os.path.join(OUT, name)
    with open(path, "wb") as fp:
        npf.write_array(fp, arr, version=version, allow_pickle=False)
    # Read back with numpy itself to record what the file holds.
    back = np.load(path, allow_pickle=False)
    with open(path, "rb") as fp:
        major, minor = npf.read_magic(fp)
    expected.append({
        "file": name,
        "descr": back.dtype.str,
        "fortran_order": bool(np.isfortran(back)),
        "version": [major, minor],
        "shape": list(back.shape),
        "float64_hex": hexbits(back),
    })


DTYPES = [("f", 2), ("f", 4), ("f", 8), ("i", 1), ("i", 2), ("i", 4), ("i", 8),
          ("u", 1), ("u", 2), ("u", 4), ("u", 8), ("b", 1)]

for kind, size in DTYPES:
    orders = ["|"] if size == 1 else ["<", ">"]
    base = np.array(values_for(kind, size), dtype=f"{kind}{size}" if kind != "b" else "?")
    for bo in orders:
        dt = base.dtype.newbyteorder(bo) if bo != "|" else base.dtype
        a2 = base.astype(dt).reshape(4, 3)
        tag = {"<": "le", ">": "be", "|": "na"}[bo]
        stem = f"{kind}{size}_{tag}"
        save(f"{stem}_c.npy", np.ascontiguousarray(a2))
        save(f"{stem}_f.npy", np.asfortranarray(a2))
        save(f"{stem}_1d.npy", base.astype(dt))

# Format versions 2.0 and 3.0 (1.0 is the default above).
grid = np.arange(12, dtype="<f8").reshape(4, 3) / 7.0
for v in [(1, 0), (2, 0), (3, 0)]:
    save(f"version_{v[0]}_c.npy", grid, version=v)
    save(f"version_{v[0]}_f_be.npy", np.asfortranarray(grid.astype(">f4")), version=v)

# Single row and single column 2-D arrays.
save("row_1x3.npy", np.array([[1.5, -2.5, 3.5]]))
save("col_3x1.npy", np.array([[1.5], [-2.5], [3.5]], dtype="<f4"))

# Arrays the reader must refuse (expected error codes are in the test).
np.save(os.path.join(OUT, "bad_0d.npy"), np.float64(3.0))
np.save(os.path.join(OUT, "bad_3d.npy"), np.zeros((2, 2, 2)))
np.save(os.path.join(OUT, "bad_nan.npy"), np.array([[1.0, 2.0], [3.0, np.nan]]))
np.save(os.path.join(OUT, "bad_structured.npy"),
        np.zeros(2, dtype=[("x", "<f8"), ("y", "<i4")]))
np.save(os.path.join(OUT, "bad_complex.npy"), np.zeros(2, dtype="<c16"))
np.save(os.path.join(OUT, "bad_empty.npy"), np.zeros((0, 3)))

# .npz: stored and deflated, two arrays each.
real = np.arange(10, dtype="<f8").reshape(5, 2) / 3.0
fake = np.asfortranarray(np.arange(6, dtype=">f4").reshape(3, 2) - 2.5)
np.savez(os.path.join(OUT, "stored.npz"), real=real, fake=fake)
np.savez_compressed(os.path.join(OUT, "compressed.npz"), real=real, fake=fake)
np.savez(os.path.join(OUT, "single.npz"), np.array([4.0, 5.0, 6.0]))
npz = {"real": hexbits(real), "fake": hexbits(fake), "arr_0": hexbits(np.array([4.0, 5.0, 6.0]))}

with open(os.path.join(OUT, "expected.json"), "w") as fp:
    # One line per fixture keeps the file small and its diffs readable.
    fp.write('{"numpy": %s,\n "files": [\n' % json.dumps(np.__version__))
    fp.write(",\n".join("  " + json.dumps(e) for e in expected))
    fp.write('\n ],\n "npz": %s\n}\n' % json.dumps(npz))
print(f"wrote {len(expected)} .npy fixtures, 3 .npz and expected.json to {OUT}")
