"""Write small NIfTI reference files to test/reference/nifti/ and their expected values to
test/reference/nifti_fixtures.json, independently of the TypeScript reader.

Run with Debian's numpy:  /usr/bin/python3 test/reference/make_nifti_fixtures.py

Headers are packed with `struct` field by field from the layouts in nifti1.h (348-byte header,
magic "n+1") and nifti2.h (540-byte header, magic "n+2\\0\\r\\n\\032\\n"), in both byte orders.
Expected voxel values are numpy's float64 raw * scl_slope + scl_inter rounded once to float32
(slope 0 means "no scaling", as nifti1.h says). Expected voxel->world affines follow nifti1.h:
method 3 (srow) when sform_code > 0, else method 2 (quaternion, written out below from the
formula in nifti1.h), else method 1 (pixdim only). Lengths in m/um are expected in mm and
times in ms/us in s. If nifti_tool (Debian nifti-bin) is installed, every NIfTI-1 file is checked with
`nifti_tool -check_hdr -check_nim` (NIfTI-2 files by reading a voxel, see below) and the script stops on a complaint.
"""
import gzip
import json
import math
import os
import shutil
import struct
import subprocess

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
OUT_DIR = os.path.join(HERE, "nifti")
JSON_PATH = os.path.join(HERE, "nifti_fixtures.json")

# nifti1.h datatype codes
DT = {
    "uint8": (2, np.uint8), "int16": (4, np.int16), "int32": (8, np.int32), "float32": (16, np.float32),
    "float64": (64, np.float64), "int8": (256, np.int8), "uint16": (512, np.uint16), "uint32": (768, np.uint32),
}
UNITS = {"m": 1, "mm": 2, "um": 3, "s": 8, "ms": 16, "us": 24}
TO_MM = {"m": 1000.0, "mm": 1.0, "um": 0.001}
TO_S = {"s": 1.0, "ms": 1e-3, "us": 1e-6}

NIFTI1_FMT = "i10s18sihcB8h3fhhhh8ffffhBBffffii80s24shh6f4f4f4f16s4s"
NIFTI2_FMT = "i8shh8q3d8dqddddddqq80s24sii6d4d4d4diii16sc15s"
assert struct.calcsize("<" + NIFTI1_FMT) == 348
assert struct.calcsize("<" + NIFTI2_FMT) == 540


def f32(x):
    """The double value of x after storage in a float32 header field."""
    return float(np.float32(x))


def header_bytes(version, endian, dims, dtype, pixdim, slope, inter, units, qform_code, sform_code, quatern, srow,
                 descrip=b"", intent_name=b""):
    code, np_type = DT[dtype]
    bitpix = np.dtype(np_type).itemsize * 8
    dim = [len(dims)] + list(dims) + [1] * (7 - len(dims))
    xyzt = UNITS[units[0]] | UNITS[units[1]]
    if version == 1:
        return struct.pack(
            endian + NIFTI1_FMT, 348, b"", b"", 0, 0, b"r", 0, *dim, 0.0, 0.0, 0.0, 0, code, bitpix, 0,
            *pixdim, 352.0, slope, inter, 0, 0, xyzt, 0.0, 0.0, 0.0, 0.0, 0, 0, descrip, b"",
            qform_code, sform_code, *quatern, *srow[0], *srow[1], *srow[2], intent_name, b"n+1\0",
        ) + b"\0\0\0\0"
    return struct.pack(
        endian + NIFTI2_FMT, 540, b"n+2\0\r\n\x1a\n", code, bitpix, *dim, 0.0, 0.0, 0.0, *pixdim, 544,
        slope, inter, 0.0, 0.0, 0.0, 0.0, 0, 0, descrip, b"", qform_code, sform_code, *quatern,
        *srow[0], *srow[1], *srow[2], 0, xyzt, 0, intent_name, b"\0", b"",
    ) + b"\0\0\0\0"


def quaternion_affine(quatern, pixdim):
    """nifti1.h method 2: a = sqrt(1-b^2-c^2-d^2); R from (a,b,c,d); x = R [i dx, j dy, qfac k dz] + qoffset."""
    b, c, d, qx, qy, qz = quatern
    a = math.sqrt(max(0.0, 1.0 - (b * b + c * c + d * d)))
    r = np.array([
        [a * a + b * b - c * c - d * d, 2 * (b * c - a * d), 2 * (b * d + a * c)],
        [2 * (b * c + a * d), a * a + c * c - b * b - d * d, 2 * (c * d - a * b)],
        [2 * (b * d - a * c), 2 * (c * d + a * b), a * a + d * d - c * c - b * b],
    ])
    qfac = -1.0 if pixdim[0] < 0 else 1.0
    scale = np.diag([abs(pixdim[1]), abs(pixdim[2]), qfac * abs(pixdim[3])])
    m = np.eye(4)
    m[:3, :3] = r @ scale
    m[:3, 3] = [qx, qy, qz]
    return m


def expected_affine(version, qform_code, sform_code, quatern, srow, pixdim, to_mm):
    store = f32 if version == 1 else float
    if sform_code > 0:
        m = np.eye(4)
        m[:3, :] = [[store(v) for v in row] for row in srow]
        source = "sform"
    elif qform_code > 0:
        m = quaternion_affine([store(v) for v in quatern], [store(v) for v in pixdim])
        source = "qform"
    else:
        m = np.diag([store(pixdim[1]), store(pixdim[2]), store(pixdim[3]), 1.0])
        source = "pixdim"
    m[:3, :] *= to_mm
    return m, source


def raw_values(dtype, n, rng):
    np_type = DT[dtype][1]
    if dtype.startswith("float"):
        v = rng.normal(0.0, 1000.0, n)
        v[0] = -0.0
        v[1] = 1.0e-40 if dtype == "float32" else 1.0e-50  # float32 subnormal / float64 value that underflows to 0
        v[2] = 3.0e38 if dtype == "float32" else 1.0e30  # near the float32 limit / large but still finite after scaling
        v[3] = 1.0 / 3.0  # needs rounding to float32 when stored as float64
        return v.astype(np_type)
    info = np.iinfo(np_type)
    v = rng.integers(info.min, info.max, n, endpoint=True, dtype=np.int64)
    v[0], v[1] = info.min, info.max
    return v.astype(np_type)


def write(name, version, endian, dims, dtype, values, pixdim, slope=0.0, inter=0.0, units=("mm", "s"),
          qform_code=0, sform_code=1, quatern=(0, 0, 0, 0, 0, 0), srow=None, compress=False, descrip=b""):
    if srow is None:
        srow = [[pixdim[1], 0, 0, -10.0], [0, pixdim[2], 0, -20.0], [0, 0, pixdim[3], -30.0]]
    head = header_bytes(version, endian, dims, dtype, pixdim, slope, inter, units, qform_code, sform_code, quatern, srow, descrip)
    np_type = DT[dtype][1]
    data = np.asarray(values, dtype=np.dtype(np_type).newbyteorder(endian)).tobytes(order="F")
    blob = head + data
    file_name = name + (".nii.gz" if compress else ".nii")
    path = os.path.join(OUT_DIR, file_name)
    with open(path, "wb") as fh:
        fh.write(gzip.compress(blob, compresslevel=6, mtime=0) if compress else blob)
    check_with_nifti_tool(path, version)

    store = f32 if version == 1 else float
    s, i = store(slope), store(inter)
    raw = np.asarray(values, dtype=np.float64).ravel(order="F")
    scaled = raw * s + i if s != 0 and math.isfinite(s) else raw
    expected = scaled.astype(np.float32).astype(np.float64)
    to_mm, to_s = TO_MM[units[0]], TO_S[units[1]]
    affine, source = expected_affine(version, qform_code, sform_code, quatern, srow, pixdim, to_mm)
    nt = dims[3] if len(dims) > 3 else 1
    tr = store(pixdim[4]) * to_s if len(dims) > 3 else 0.0
    return {
        "file": file_name, "niftiVersion": version, "datatype": dtype, "littleEndian": endian == "<",
        "dims": [dims[0], dims[1], dims[2], nt], "sclSlope": s, "sclInter": i,
        "transformSource": source, "affine": [float(v) for v in affine.ravel()],
        "spacingMm": [float(np.linalg.norm(affine[:3, c])) for c in range(3)],
        "trSec": tr, "spaceUnit": units[0], "timeUnit": units[1],
        "data": [float(v) if math.isfinite(v) else None for v in expected],
    }


def check_with_nifti_tool(path, version):
    tool = shutil.which("nifti_tool")
    if tool is None:
        return
    if version == 2:
        # nifti_tool 2.09's -check_hdr/-check_nim go through the NIfTI-1 header struct and report
        # "bad datatype" for every NIfTI-2 file (observed), so a NIfTI-2 file is checked by having
        # nifti_tool read its first voxel instead
        out = subprocess.run([tool, "-disp_ci", "0", "0", "0", "0", "0", "0", "0", "-quiet", "-infiles", path], capture_output=True, text=True)
        if out.returncode != 0 or out.stderr.strip() or not out.stdout.strip():
            raise SystemExit(f"nifti_tool cannot read {path}:\n{out.stdout}{out.stderr}")
        return
    out = subprocess.run([tool, "-check_hdr", "-check_nim", "-infiles", path], capture_output=True, text=True)
    if "IS GOOD" not in out.stdout or "BAD" in out.stdout or out.returncode != 0:
        raise SystemExit(f"nifti_tool rejects {path}:\n{out.stdout}{out.stderr}")


def main():
    rng = np.random.default_rng(20240611)
    os.makedirs(OUT_DIR, exist_ok=True)
    for f in os.listdir(OUT_DIR):
        os.remove(os.path.join(OUT_DIR, f))
    dims = (3, 4, 2, 2)
    n = int(np.prod(dims))
    pixdim = [1.0, 2.0, 2.5, 3.0, 1.5, 1.0, 1.0, 1.0]
    # slope/inter per datatype: exact, inexact (0.1 in float32) and "slope 0 = none, inter ignored"
    scaling = {
        "uint8": (0.0, 7.0), "int8": (2.0, 1.0), "int16": (0.5, -3.0), "uint16": (0.1, 0.0),
        "int32": (1.0, 0.0), "uint32": (0.0, 0.0), "float32": (0.0, 0.0), "float64": (1.5, 0.25),
    }
    files = []
    for dtype in DT:
        for endian, tag in (("<", "le"), (">", "be")):
            values = raw_values(dtype, n, rng).reshape(dims, order="F")
            slope, inter = scaling[dtype]
            files.append(write(f"dt_{dtype}_{tag}", 1, endian, dims, dtype, values, pixdim, slope, inter))
    # NIfTI-2 in both byte orders, and gzip-compressed variants
    files.append(write("n2_float32_le", 2, "<", dims, "float32", raw_values("float32", n, rng).reshape(dims, order="F"), pixdim))
    files.append(write("n2_int16_be", 2, ">", dims, "int16", raw_values("int16", n, rng).reshape(dims, order="F"), pixdim, 0.1, -7.0))
    files.append(write("n2_float64_be", 2, ">", dims, "float64", raw_values("float64", n, rng).reshape(dims, order="F"), pixdim, compress=True))
    files.append(write("dt_int16_be", 1, ">", dims, "int16", raw_values("int16", n, rng).reshape(dims, order="F"), pixdim, 0.5, -3.0, compress=True))
    # transforms: a rotated qform with qfac -1 and a different sform
    quatern = (0.1, -0.2, 0.3, 12.5, -40.0, 7.25)
    qpix = [-1.0, 2.0, 2.5, 3.0, 2.0, 1.0, 1.0, 1.0]
    srow = [[-2.0, 0.1, 0.0, 90.0], [0.0, 2.5, -0.2, -126.0], [0.05, 0.0, 3.0, -72.0]]
    vals = rng.normal(100.0, 10.0, n).astype(np.float32).reshape(dims, order="F")
    files.append(write("xf_sform_and_qform", 1, "<", dims, "float32", vals, qpix, qform_code=1, sform_code=2, quatern=quatern, srow=srow))
    files.append(write("xf_qform_only", 1, "<", dims, "float32", vals, qpix, qform_code=1, sform_code=0, quatern=quatern, srow=srow))
    files.append(write("xf_qform_only_n2", 2, ">", dims, "float32", vals, qpix, qform_code=2, sform_code=0, quatern=quatern, srow=srow))
    files.append(write("xf_pixdim_only", 1, "<", dims, "float32", vals, qpix, qform_code=0, sform_code=0, quatern=quatern, srow=srow))
    # units: metres + milliseconds, micrometres + microseconds
    pix_m = [1.0, 0.002, 0.0025, 0.003, 2000.0, 1.0, 1.0, 1.0]
    srow_m = [[0.002, 0, 0, -0.09], [0, 0.0025, 0, -0.126], [0, 0, 0.003, -0.072]]
    files.append(write("units_m_ms", 1, "<", dims, "float32", vals, pix_m, units=("m", "ms"), srow=srow_m))
    pix_um = [1.0, 2000.0, 2500.0, 3000.0, 2.0e6, 1.0, 1.0, 1.0]
    files.append(write("units_um_us", 1, "<", dims, "float32", vals, pix_um, units=("um", "us"), qform_code=1, sform_code=0, quatern=(0, 0, 0, -90000.0, 0, 0)))
    # a 3D image
    dims3 = (3, 4, 2)
    files.append(write("dims_3d", 1, "<", dims3, "int16", raw_values("int16", 24, rng).reshape(dims3, order="F"), [1.0, 2.0, 2.5, 3.0, 0, 1, 1, 1]))
    # NaN and infinities at known places (column-major order = NIfTI order)
    nf = rng.normal(0.0, 1.0, n).astype(np.float32)
    nf[5], nf[17], nf[30] = np.nan, np.inf, -np.inf
    entry = write("non_finite", 1, "<", dims, "float32", nf.reshape(dims, order="F"), pixdim)
    entry.update({"nonFiniteCount": 3, "firstNonFiniteIndex": 5, "nonFiniteIndices": [5, 17, 30]})
    files.append(entry)

    doc = {
        "_comment": "generated by test/reference/make_nifti_fixtures.py: do not edit",
        "numpy": np.__version__,
        "files": files,
    }
    with open(JSON_PATH, "w") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")
    print(f"wrote {len(files)} files to {OUT_DIR} and {JSON_PATH}")


if __name__ == "__main__":
    main()
