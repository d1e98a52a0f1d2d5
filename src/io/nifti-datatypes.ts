/** A voxel type boldsweep can read from NIfTI, with its nifti1.h code and size. */
export interface NiftiDatatype {
  /** nifti1.h DT_* code. */
  code: number;
  /** Our name for it (also reported in NiftiReadInfo.datatype). */
  name: 'uint8' | 'int8' | 'int16' | 'uint16' | 'int32' | 'uint32' | 'float32' | 'float64';
  /** Bytes per voxel. */
  bytes: 1 | 2 | 4 | 8;
  /** Typed array type that holds one voxel in host byte order. */
  array: Uint8ArrayConstructor | Int8ArrayConstructor | Int16ArrayConstructor | Uint16ArrayConstructor | Int32ArrayConstructor | Uint32ArrayConstructor | Float32ArrayConstructor | Float64ArrayConstructor;
}

/** The supported types, keyed by nifti1.h code (DT_UINT8 2, DT_INT16 4, DT_INT32 8, DT_FLOAT32 16, DT_FLOAT64 64, DT_INT8 256, DT_UINT16 512, DT_UINT32 768). */
export const NIFTI_DATATYPES: ReadonlyMap<number, NiftiDatatype> = new Map<number, NiftiDatatype>([
  [2, { code: 2, name: 'uint8', bytes: 1, array: Uint8Array }],
  [4, { code: 4, name: 'int16', bytes: 2, array: Int16Array }],
  [8, { code: 8, name: 'int32', bytes: 4, array: Int32Array }],
  [16, { code: 16, name: 'float32', bytes: 4, array: Float32Array }],
  [64, { code: 64, name: 'float64', bytes: 8, array: Float64Array }],
  [256, { code: 256, name: 'int8', bytes: 1, array: Int8Array }],
  [512, { code: 512, name: 'uint16', bytes: 2, array: Uint16Array }],
  [768, { code: 768, name: 'uint32', bytes: 4, array: Uint32Array }],
]);

/** Names of the nifti1.h types we refuse, for the error message. */
const UNSUPPORTED_NAMES: Record<number, string> = {
  0: 'unknown', 1: 'binary', 32: 'complex64', 128: 'rgb24', 1024: 'int64', 1280: 'uint64',
  1536: 'float128', 1792: 'complex128', 2048: 'complex256', 2304: 'rgba32',
};

/**
 * Human name of a nifti1.h datatype code, supported or not.
 * @param code - DT_* code from the header
 * @returns a short name such as 'float32' or 'complex64' or 'code 99'
 * @example niftiDatatypeName(16) // 'float32'
 */
export function niftiDatatypeName(code: number): string {
  return NIFTI_DATATYPES.get(code)?.name ?? UNSUPPORTED_NAMES[code] ?? `code ${code}`;
}
