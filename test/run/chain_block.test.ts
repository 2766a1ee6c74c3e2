import { describe, expect, test } from "vitest";
import { crc32 } from "../../src/run/crc32.ts";
import { encodeBlock, readBlockValues, scanBlocks } from "../../src/run/chain_block.ts";

describe("crc32()", () => {
  test("crc32() gives the standard check value", () => {
    // CRC-32/ISO-HDLC check value for the ASCII string "123456789" is 0xCBF43926
    // (Williams 1993, "A painless guide to CRC error detection algorithms", and the
    // CRC catalogue of Cook; also zlib's crc32). Recalled from memory; it is the
    // catalogue's defining check.
    expect(crc32(new TextEncoder().encode("123456789"))).toBe(0xcbf43926);
    expect(crc32(new Uint8Array(0))).toBe(0);
  });

  test("crc32() equals a bit-by-bit CRC for every length and offset up to 40", () => {
    // Independent reference: the defining shift register, one bit at a time, no tables.
    const bitwise = (b: Uint8Array): number => {
      let c = 0xffffffff;
      for (const byte of b) {
        c ^= byte;
        for (let k = 0; k < 8; k++) c = (c >>> 1) ^ (0xedb88320 & -(c & 1));
      }
      return (c ^ 0xffffffff) >>> 0;
    };
    const bytes = Uint8Array.from({ length: 64 }, (_, i) => (i * 151 + 17) & 0xff);
    for (let start = 0; start < 9; start++) {
      for (let n = 0; n <= 40; n++) {
        expect(crc32(bytes, { start, end: start + n })).toBe(
          bitwise(bytes.subarray(start, start + n)),
        );
      }
    }
  });
});

describe("scanBlocks()", () => {
  const shape = { walkers: 2, columns: 3 };
  const blockA = encodeBlock(
    { firstStep: 0, steps: 2, walkers: 2, columns: 3 },
    Float64Array.from({ length: 12 }, (_, i) => i + 0.5),
  );
  const blockB = encodeBlock(
    { firstStep: 2, steps: 1, walkers: 2, columns: 3 },
    Float64Array.from({ length: 6 }, (_, i) => -i),
  );
  const both = new Uint8Array(blockA.length + blockB.length);
  both.set(blockA);
  both.set(blockB, blockA.length);

  test("scanBlocks() decodes consecutive blocks exactly", () => {
    const scan = scanBlocks(both, shape);
    expect(scan.stop).toBe("end");
    expect(scan.blocks.length).toBe(2);
    const out = new Float64Array(18);
    readBlockValues(both, scan.blocks[0]!, out, 0);
    readBlockValues(both, scan.blocks[1]!, out, 12);
    expect(Array.from(out.subarray(0, 3))).toEqual([0.5, 1.5, 2.5]);
    expect(Array.from(out.subarray(12, 15))).toEqual([-0, -1, -2]);
  });

  test("scanBlocks() treats every truncation of the last block as torn, never as data", () => {
    for (let cut = blockA.length; cut < both.length; cut++) {
      const scan = scanBlocks(both.subarray(0, cut), shape);
      expect(scan.blocks.length).toBe(1);
      expect(scan.validBytes).toBe(blockA.length);
      expect(scan.stop).toBe(cut === blockA.length ? "end" : "torn");
    }
  });

  test("scanBlocks() detects any single flipped bit", () => {
    for (let byte = 0; byte < both.length; byte += 7) {
      const bad = both.slice();
      bad[byte] = bad[byte]! ^ 0x10;
      const scan = scanBlocks(bad, shape);
      const firstBad = byte < blockA.length ? 0 : 1;
      expect(scan.blocks.length).toBe(firstBad);
      expect(scan.stop).not.toBe("end");
    }
  });

  test("scanBlocks() rejects a block with the wrong step sequence or shape", () => {
    expect(scanBlocks(blockB, shape).stop).toBe("corrupt");
    expect(scanBlocks(blockA, { walkers: 3, columns: 3 }).stop).toBe("corrupt");
  });
});
