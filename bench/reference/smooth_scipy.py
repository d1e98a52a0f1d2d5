#!/usr/bin/python3
"""Reference timing for bench/smooth.ts: scipy.ndimage.gaussian_filter on every volume of a run.

Usage: /usr/bin/python3 bench/reference/smooth_scipy.py RAW NX NY NZ NT SX SY SZ FWHM_MM MODE [OUT_RAW]
RAW holds float32 little-endian voxels, x fastest, then y, z, t (NIfTI order). Sigma per axis in
voxels = FWHM_MM / (2 sqrt(2 ln 2)) / spacing; truncate 4.0; the same boundary mode. Times the
whole per-volume loop three times and prints the median: "seconds <s>". With OUT_RAW, the last
result is written there (float32) so the caller can compare values.
"""
import math
import sys
import time

import numpy as np
from scipy import ndimage


def main():
    raw, nx, ny, nz, nt, sx, sy, sz, fwhm, mode = sys.argv[1:11]
    nx, ny, nz, nt = int(nx), int(ny), int(nz), int(nt)
    spacing = (float(sx), float(sy), float(sz))
    fwhm = float(fwhm)
    data = np.fromfile(raw, dtype="<f4").reshape(nt, nz, ny, nx)
    per_sigma = 2.0 * math.sqrt(2.0 * math.log(2.0))
    sigma_zyx = (fwhm / per_sigma / spacing[2], fwhm / per_sigma / spacing[1], fwhm / per_sigma / spacing[0])
    out = np.empty_like(data)
    times = []
    for _ in range(3):
        t0 = time.perf_counter()
        for t in range(nt):
            ndimage.gaussian_filter(data[t], sigma=sigma_zyx, mode=mode, truncate=4.0, output=out[t])
        times.append(time.perf_counter() - t0)
    if len(sys.argv) > 11:
        out.tofile(sys.argv[11])
    print("seconds %.6f" % sorted(times)[1])


if __name__ == "__main__":
    main()
