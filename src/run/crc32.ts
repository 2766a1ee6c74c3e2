/**
 * CRC-32 (IEEE 802.3 polynomial 0xEDB88320, reflected), as specified for
 * PNG in ISO/IEC 15948:2004 Annex D and zlib (RFC 1952 sec. 8). Check value:
 * crc32("123456789") = 0xCBF43926.
 *
 * Method: table-driven, eight bytes per iteration ("slicing-by-8", Kounavis &
 * Berry 2005, IEEE ISCC, "A systematic approach to building high performance
 * software-based CRC generators"): table k maps a byte to its CRC contribution
 * k bytes further on, T_k[n] = (T_{k−1}[n] >>> 8) ^ T_0[T_{k−1}[n] & 0xff].
 * @module
 */

const TABLES = (() => {
  const t = new Uint32Array(8 * 256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  for (let k = 1; k < 8; k++) {
    for (let n = 0; n < 256; n++) {
      const prev = t[(k - 1) * 256 + n]!;
      t[k * 256 + n] = ((prev >>> 8) ^ t[prev & 0xff]!) >>> 0;
    }
  }
  return t;
})();

/** CRC-32 of `bytes[start, end)`. */
export function crc32(bytes: Uint8Array, options: { start?: number; end?: number } = {}): number {
  const end = options.end ?? bytes.length;
  const t = TABLES;
  let i = options.start ?? 0;
  let c = 0xffffffff;
  for (; i + 8 <= end; i += 8) {
    c ^= bytes[i]! | (bytes[i + 1]! << 8) | (bytes[i + 2]! << 16) | (bytes[i + 3]! << 24);
    c = t[1792 + (c & 0xff)]! ^ t[1536 + ((c >>> 8) & 0xff)]! ^ t[1280 + ((c >>> 16) & 0xff)]! ^
      t[1024 + (c >>> 24)]! ^ t[768 + bytes[i + 4]!]! ^ t[512 + bytes[i + 5]!]! ^
      t[256 + bytes[i + 6]!]! ^ t[bytes[i + 7]!]!;
  }
  for (; i < end; i++) c = t[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
