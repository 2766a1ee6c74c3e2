/**
 * Property tests of the chain-block decoder (`scanBlocks`) and the file
 * reader (`readChain`): arbitrary bytes never throw; valid blocks round-trip
 * bit for bit; any single corrupted byte and any truncation are detected, and
 * everything before the damage is returned unchanged. Fixed seed, bounded runs.
 */
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import {
  BLOCK_HEADER_BYTES,
  encodeBlock,
  readBlockValues,
  scanBlocks,
} from "../../src/run/chain_block.ts";
import { readChain } from "../../src/run/chain_file.ts";
import { crc32 } from "../../src/run/crc32.ts";

const SEED = 424242;

interface Plan {
  walkers: number;
  columns: number;
  blocks: Float64Array[];
  steps: number[];
}

/** Shapes and values of 1–4 consecutive blocks, any doubles including NaN and ±Infinity. */
const planArb: fc.Arbitrary<Plan> = fc
  .record({
    walkers: fc.integer({ min: 1, max: 4 }),
    columns: fc.integer({ min: 1, max: 4 }),
    steps: fc.array(fc.integer({ min: 0, max: 3 }), { minLength: 1, maxLength: 4 }),
  })
  .chain(({ walkers, columns, steps }) =>
    fc
      .tuple(...steps.map((s) =>
        fc.float64Array({ minLength: s * walkers * columns, maxLength: s * walkers * columns })
      ))
      .map((blocks) => ({ walkers, columns, steps, blocks }))
  );

function encodePlan(p: Plan): { bytes: Uint8Array; offsets: number[] } {
  const parts: Uint8Array[] = [];
  const offsets: number[] = [];
  let first = 0;
  let off = 0;
  p.steps.forEach((s, k) => {
    const b = encodeBlock(
      { firstStep: first, steps: s, walkers: p.walkers, columns: p.columns },
      p.blocks[k]!,
    );
    parts.push(b);
    offsets.push(off);
    off += b.length;
    first += s;
  });
  const bytes = new Uint8Array(off);
  parts.forEach((b, k) => bytes.set(b, offsets[k]!));
  return { bytes, offsets };
}

/** Same doubles, NaN equal to NaN (Object.is), as the decoder must give back. */
function sameValues(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

/** The first `count` blocks decode to the planned values. */
function checkPrefix(bytes: Uint8Array, p: Plan, count: number): void {
  const scan = scanBlocks(bytes, { walkers: p.walkers, columns: p.columns });
  expect(scan.blocks.length).toBe(count);
  scan.blocks.forEach((b, k) => {
    const out = new Float64Array(p.blocks[k]!.length);
    readBlockValues(bytes, b, out, 0);
    expect(sameValues(out, p.blocks[k]!)).toBe(true);
  });
}

describe("scanBlocks()", () => {
  test("scanBlocks() never throws on arbitrary bytes and reports a consistent prefix", () => {
    fc.assert(
      fc.property(
        fc.uint8Array({ maxLength: 300 }),
        fc.integer({ min: 1, max: 4 }),
        fc.integer({ min: 1, max: 4 }),
        (bytes, walkers, columns) => {
          const scan = scanBlocks(bytes, { walkers, columns });
          expect(scan.validBytes).toBeLessThanOrEqual(bytes.length);
          expect(scan.stop === "end").toBe(scan.validBytes === bytes.length);
        },
      ),
      { seed: SEED, numRuns: 3000 },
    );
  });

  test("scanBlocks() gives back encoded blocks bit for bit", () => {
    fc.assert(
      fc.property(planArb, (p) => {
        const { bytes } = encodePlan(p);
        const scan = scanBlocks(bytes, { walkers: p.walkers, columns: p.columns });
        expect(scan.stop).toBe("end");
        checkPrefix(bytes, p, p.steps.length);
      }),
      { seed: SEED, numRuns: 1000 },
    );
  });

  test("scanBlocks() detects any single corrupted byte and keeps the blocks before it", () => {
    fc.assert(
      fc.property(
        planArb,
        fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }),
        fc.integer({ min: 1, max: 255 }),
        (p, where, xor) => {
          const { bytes, offsets } = encodePlan(p);
          const pos = Math.floor(where * bytes.length);
          const bad = bytes.slice();
          bad[pos] = bad[pos]! ^ xor;
          // CRC-32 detects every error burst of at most 32 bits (Peterson & Brown 1961, recalled from memory:
          // Proc. IRE 49(1), 228), so one changed byte is always caught.
          const hit = offsets.filter((o) => o <= pos).length - 1;
          const scan = scanBlocks(bad, { walkers: p.walkers, columns: p.columns });
          expect(scan.stop).not.toBe("end");
          expect(scan.validBytes).toBe(offsets[hit]);
          checkPrefix(bad, p, hit);
        },
      ),
      { seed: SEED, numRuns: 2000 },
    );
  });

  test("scanBlocks() treats any truncation as torn and keeps the complete blocks", () => {
    fc.assert(
      fc.property(planArb, fc.double({ min: 0, max: 1, noNaN: true }), (p, where) => {
        const { bytes, offsets } = encodePlan(p);
        const cut = Math.floor(where * bytes.length);
        const complete = [...offsets, bytes.length].filter((o, k) => k > 0 && o <= cut).length;
        const scan = scanBlocks(bytes.subarray(0, cut), { walkers: p.walkers, columns: p.columns });
        const atBoundary = cut === 0 || offsets.includes(cut) || cut === bytes.length;
        expect(scan.stop).toBe(atBoundary ? "end" : "torn");
        checkPrefix(bytes.subarray(0, cut), p, complete);
      }),
      { seed: SEED, numRuns: 1000 },
    );
  });
});

describe("readChain()", () => {
  let dir = "";
  beforeAll(async () => {
    dir = await Deno.makeTempDir({ prefix: "rvwalk-fuzz-chain-" });
  });
  afterAll(async () => {
    if (dir !== "") await Deno.remove(dir, { recursive: true });
  });

  test("readChain() returns exactly the valid steps of a damaged file, thinned as asked", async () => {
    await fc.assert(
      fc.asyncProperty(
        planArb,
        fc.constantFrom("none", "flip", "cut", "garbage"),
        fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        fc.integer({ min: 1, max: 3 }),
        async (p, damage, where, from, thin) => {
          const { bytes, offsets } = encodePlan(p);
          let file = bytes;
          let validBlocks = p.steps.length;
          const pos = Math.floor(where * bytes.length);
          if (damage === "flip") {
            file = bytes.slice();
            file[pos] = file[pos]! ^ 0x5a;
            validBlocks = offsets.filter((o) => o <= pos).length - 1;
          } else if (damage === "cut") {
            file = bytes.subarray(0, pos);
            validBlocks = [...offsets, bytes.length].filter((o, k) => k > 0 && o <= pos).length;
          } else if (damage === "garbage") {
            file = new Uint8Array(bytes.length + 40);
            file.set(bytes);
            file.fill(0xab, bytes.length);
          }
          await Deno.writeFile(`${dir}/chain.bin`, file);
          const r = await readChain(dir, { walkers: p.walkers, columns: p.columns }, {
            from,
            thin,
          });
          // Expected steps, computed here from the plan.
          const row = p.walkers * p.columns;
          const all: number[][] = [];
          for (let k = 0; k < validBlocks; k++) {
            for (let s = 0; s < p.steps[k]!; s++) {
              all.push(Array.from(p.blocks[k]!.subarray(s * row, (s + 1) * row)));
            }
          }
          const kept = all.filter((_, g) => g >= from && (g - from) % thin === 0);
          expect(r.stepsOnDisk).toBe(all.length);
          expect(r.chain.steps).toBe(kept.length);
          expect(sameValues(r.chain.data, Float64Array.from(kept.flat()))).toBe(true);
          expect(r.stop === "end").toBe(
            damage === "none" || (damage === "cut" && (pos === 0 || offsets.includes(pos))),
          );
        },
      ),
      { seed: SEED, numRuns: 150 },
    );
  });

  test("readChain() allocates nothing for a valid header that claims more data than the file holds", async () => {
    // A hand-made header with a correct checksum claiming 2^31 steps: the reader
    // must call the block torn from the file size alone.
    const head = new Uint8Array(BLOCK_HEADER_BYTES);
    const dv = new DataView(head.buffer);
    dv.setUint32(0, 0x42575652, true);
    dv.setUint32(4, 1, true);
    dv.setUint32(8, 0, true);
    dv.setUint32(12, 2 ** 31, true);
    dv.setUint32(16, 4, true);
    dv.setUint32(20, 4, true);
    dv.setUint32(28, crc32(head, { end: 28 }), true);
    await Deno.writeFile(`${dir}/chain.bin`, head);
    const r = await readChain(dir, { walkers: 4, columns: 4 });
    expect(r.stop).toBe("torn");
    expect(r.chain.steps).toBe(0);
    expect(r.detail).toMatch(/^block at byte 0 is cut short: needs \d+ bytes, 32 on disk$/);
  });
});
