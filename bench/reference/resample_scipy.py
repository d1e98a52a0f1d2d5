#!/usr/bin/python3
"""Reference timing for bench/resample.ts: scipy.ndimage.affine_transform on every volume of a run.

Usage: /usr/bin/python3 bench/reference/resample_scipy.py RAW NX NY NZ NT ORDER M00 .. M33 [OUT_RAW]
RAW holds float32 little-endian voxels, x fastest, then y, z, t (NIfTI order). M is the row-major
4x4 map output voxel (i, j, k) -> source voxel, the same for every volume; mode 'constant', cval 0,
spline prefilter on (scipy's default for order > 1). The array is (t, z, y, x) in numpy, so the map
is given to scipy with its axes reversed. Times the whole per-volume loop three times and prints
the median: "seconds <s>". With OUT_RAW the last result is written there (float32).
Debian's python3-scipy 1.10 / numpy 1.24.
"""
import sys
import time

import numpy as np
from scipy import ndimage


def main():
    raw, nx, ny, nz, nt, order = sys.argv[1:7]
    nx, ny, nz, nt, order = int(nx), int(ny), int(nz), int(nt), int(order)
    m = np.array([float(v) for v in sys.argv[7:23]]).reshape(4, 4)
    data = np.fromfile(raw, dtype="<f4").reshape(nt, nz, ny, nx)
    # (x, y, z) -> (z, y, x): reverse rows and columns of the 3x3 part and the offset
    matrix = m[:3, :3][::-1, ::-1].copy()
    offset = m[:3, 3][::-1].copy()
    out = np.empty_like(data)
    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        for t in range(nt):
            ndimage.affine_transform(data[t], matrix, offset=offset, order=order, mode="constant", cval=0.0, output=out[t])
        times.append(time.perf_counter() - t0)
    if len(sys.argv) > 23:
        out.tofile(sys.argv[23])
    print("seconds %.6f" % sorted(times)[1])


if __name__ == "__main__":
    main()
