#!/usr/bin/python3
"""Times scipy.ndimage.map_coordinates(order=1, mode='constant') moving one volume through a rigid
voxel map, for bench/phantom.ts. Args: raw float32 input path (x fastest), nx ny nz, 16 row-major
numbers of the output->source voxel map, raw float32 output path. Prints the median of 5 timings
(seconds) of one volume. Debian's python3-scipy 1.10 / numpy 1.24.
"""
import sys
import time
import numpy as np
from scipy.ndimage import map_coordinates

src_path, nx, ny, nz = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4])
m = np.array([float(v) for v in sys.argv[5:21]]).reshape(4, 4)
out_path = sys.argv[21]
img = np.fromfile(src_path, dtype=np.float32).reshape((nx, ny, nz), order='F')
ii, jj, kk = np.meshgrid(np.arange(nx, dtype=float), np.arange(ny, dtype=float), np.arange(nz, dtype=float), indexing='ij')
times = []
for _ in range(5):
    t0 = time.perf_counter()
    # the coordinates are part of the work, as in our resample (computed per voxel there)
    pts = np.stack([ii.ravel(order='F'), jj.ravel(order='F'), kk.ravel(order='F'), np.ones(ii.size)])
    src = m @ pts
    out = map_coordinates(img, src[:3], order=1, mode='constant', cval=0.0)
    times.append(time.perf_counter() - t0)
out.astype(np.float32).tofile(out_path)
print(sorted(times)[2])
