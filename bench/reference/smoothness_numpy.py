#!/usr/bin/python3
"""Reference for bench/thresholds.ts: the same smoothness estimate as src/model/smoothness.ts written in
numpy (Debian python3-numpy): per-voxel unit-norm residuals, squared first differences between in-mask
neighbours pooled over voxels and time, times (nu - 2)/(nu - 1).
Usage: smoothness_numpy.py residuals.f32 mask.u8 nx ny nz nt dof
Prints 'seconds <s>' (median of 3) and 'lambda <lx> <ly> <lz>'.
"""
import sys, time
import numpy as np

path, mpath = sys.argv[1], sys.argv[2]
nx, ny, nz, nt = (int(v) for v in sys.argv[3:7])
dof = float(sys.argv[7])
r = np.fromfile(path, dtype=np.float32).reshape(nt, nz, ny, nx)
mask = np.fromfile(mpath, dtype=np.uint8).reshape(nz, ny, nx) > 0

def estimate():
    ss = np.einsum('tzyx,tzyx->zyx', r, r, dtype=np.float64)
    use = mask & (ss > 0)
    inv = np.zeros_like(ss); inv[use] = 1 / np.sqrt(ss[use])
    u = r * inv  # float64 (nt, nz, ny, nx)
    lam = []
    for axis in (3, 2, 1):  # x, y, z in (t, z, y, x) order
        a = [slice(None)] * 4; b = [slice(None)] * 4
        a[axis] = slice(1, None); b[axis] = slice(None, -1)
        ma = [slice(None)] * 3; mb = [slice(None)] * 3
        ma[axis - 1] = slice(1, None); mb[axis - 1] = slice(None, -1)
        pair = use[tuple(ma)] & use[tuple(mb)]
        d = (u[tuple(a)] - u[tuple(b)])[:, pair]
        lam.append(float((d * d).sum()) / pair.sum() * (dof - 2) / (dof - 1))
    return lam

times = []
for _ in range(3):
    t0 = time.perf_counter(); lam = estimate(); times.append(time.perf_counter() - t0)
print('seconds', sorted(times)[1])
print('lambda', *lam)
