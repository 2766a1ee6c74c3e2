/**
 * CRC-32 (IEEE 802.3 polynomial 0xEDB88320, reflected), as specified for
 * PNG in ISO/IEC 15948:2004 Annex D and zlib (RFC 1952 sec. 8). Check value:
 * crc32("123456789") = 0xCBF43926.
 * @module
 */

const TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 of `bytes[start, end)`. */
export function crc32(bytes: Uint8Array, options: { start?: number; end?: number } = {}): number {
  const end = options.end ?? bytes.length;
  let c = 0xffffffff;
  for (let i = options.start ?? 0; i < end; i++) c = TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
