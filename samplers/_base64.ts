/**
 * Lossless text encoding of Float64Arrays: base64 (RFC 4648, §4) of the
 * IEEE 754 little-endian bytes, so every finite value, −0, ±Infinity and NaN survive
 * JSON (a NaN may come back with another payload). Private to `samplers/`.
 * @module
 */

/** Base64 of the little-endian bytes of `values`. */
export function encodeFloat64(values: Float64Array): string {
  const bytes = new Uint8Array(values.length * 8);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setFloat64(i * 8, values[i]!, true);
  let binary = "";
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) {
    binary += String.fromCharCode(...bytes.subarray(i, i + chunk));
  }
  return btoa(binary);
}

/**
 * Inverse of {@linkcode encodeFloat64}.
 *
 * @throws {TypeError} when `text` is not base64 of exactly `options.length`
 *   doubles; `options.field` names the value in the message.
 */
export function decodeFloat64(
  text: unknown,
  options: { length: number; field: string },
): Float64Array {
  const { length, field } = options;
  if (typeof text !== "string") {
    throw new TypeError(
      `Cannot restore sampler state as ${field} is not a base64 string: ${field}=${String(text)}`,
    );
  }
  let binary: string;
  try {
    binary = atob(text);
  } catch {
    throw new TypeError(
      `Cannot restore sampler state as ${field} is not valid base64: length=${text.length}`,
    );
  }
  if (binary.length !== length * 8) {
    throw new TypeError(
      `Cannot restore sampler state as ${field} has the wrong size: bytes=${binary.length}, expected=${
        length * 8
      }`,
    );
  }
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  const view = new DataView(bytes.buffer);
  const values = new Float64Array(length);
  for (let i = 0; i < length; i++) values[i] = view.getFloat64(i * 8, true);
  return values;
}
