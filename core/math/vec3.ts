/**
 * 3-vectors as plain arrays or Float64Array views: the types the frame and element functions
 * take. Core code works on components in place (out parameters, scratch at module scope; see
 * frames.ts), so no vector helper functions live here; tests build and check vectors with
 * test/fuzz/vec.ts.
 */

/** A readable 3-vector: a plain array or a typed-array view. */
export type Vec3Like = ArrayLike<number>;
/** A writable 3-vector. */
export type Vec3 = number[] | Float64Array;
