#!/usr/bin/python3
"""Reference timing for bench/glm.ts: numpy.linalg.lstsq on a whole run at once.

Usage: /usr/bin/python3 bench/reference/glm_numpy.py RAW NVOX NT DESIGN P [OUT_BETAS]
RAW holds float32 little-endian voxels, volume after volume (NIfTI order), read as an (NT, NVOX)
array; DESIGN holds the float64 little-endian design, row-major (NT, P). Times
numpy.linalg.lstsq(X, Y, rcond=None) (betas, residual sums of squares, rank, singular values) three
times and prints the median: "seconds <s>". With OUT_BETAS the betas (P, NVOX) are written there as
float64 so the caller can compare values. numpy's LAPACK/BLAS backend (and OPENBLAS_CORETYPE, when
OpenBLAS is the backend: it pins the CPU kernel OpenBLAS uses) affects this time; they are printed
as "blas <name>" and "coretype <value>".
"""
import os
import sys
import time

import numpy as np


def main():
    raw, nvox, nt, design, p = sys.argv[1:6]
    nvox, nt, p = int(nvox), int(nt), int(p)
    y = np.fromfile(raw, dtype="<f4").reshape(nt, nvox)
    x = np.fromfile(design, dtype="<f8").reshape(nt, p)
    times = []
    betas = None
    for _ in range(3):
        t0 = time.perf_counter()
        betas, rss, rank, sv = np.linalg.lstsq(x, y, rcond=None)
        times.append(time.perf_counter() - t0)
    if len(sys.argv) > 6:
        np.ascontiguousarray(betas, dtype="<f8").tofile(sys.argv[6])
    # Debian's numpy links the generic libblas/liblapack; the alternatives system picks the real one
    blas = "unknown"
    for cand in ("/usr/lib/x86_64-linux-gnu/libblas.so.3", "/usr/lib/aarch64-linux-gnu/libblas.so.3"):
        if os.path.exists(cand):
            blas = os.path.basename(os.path.dirname(os.path.realpath(cand)))
    print("blas %s" % blas)
    print("coretype %s" % os.environ.get("OPENBLAS_CORETYPE", "unset"))
    print("seconds %.6f" % sorted(times)[1])


if __name__ == "__main__":
    main()
