/**
 * The chain file format: a sequence of self-checking blocks, appended only.
 *
 * Block layout (all little-endian):
 * ```
 * offset size  field
 *   0     4    magic "RVWB"
 *   4     4    u32 format version (1)
 *   8     4    u32 first step index of the block (0-based)
 *  12     4    u32 number of steps in the block
 *  16     4    u32 walkers
 *  20     4    u32 columns per walker
 *  24     4    u32 CRC-32 of the payload
 *  28     4    u32 CRC-32 of bytes 0..27
 *  32     8·steps·walkers·columns  payload: Float64 values in [step][walker][column] order
 * ```
 * A reader stops at the first block that is incomplete or fails a check; a
 * torn last block (a write cut short) is therefore invisible, never misread.
 * @module
 */
import { crc32 } from "./crc32.ts";

export const BLOCK_MAGIC = 0x42575652; // "RVWB" read as little-endian u32
export const BLOCK_VERSION = 1;
export const BLOCK_HEADER_BYTES = 32;

/** Header fields of one block. */
export interface BlockHeader {
  readonly firstStep: number;
  readonly steps: number;
  readonly walkers: number;
  readonly columns: number;
}

/** Encode one block; `values` holds steps·walkers·columns numbers. */
export function encodeBlock(header: BlockHeader, values: Float64Array): Uint8Array {
  const count = header.steps * header.walkers * header.columns;
  if (values.length < count) {
    throw new RangeError(
      `Cannot encode block as values are too few: expected=${count}, found=${values.length}`,
    );
  }
  const out = new Uint8Array(BLOCK_HEADER_BYTES + 8 * count);
  const dv = new DataView(out.buffer);
  for (let i = 0; i < count; i++) dv.setFloat64(BLOCK_HEADER_BYTES + 8 * i, values[i]!, true);
  dv.setUint32(0, BLOCK_MAGIC, true);
  dv.setUint32(4, BLOCK_VERSION, true);
  dv.setUint32(8, header.firstStep, true);
  dv.setUint32(12, header.steps, true);
  dv.setUint32(16, header.walkers, true);
  dv.setUint32(20, header.columns, true);
  dv.setUint32(24, crc32(out, { start: BLOCK_HEADER_BYTES }), true);
  dv.setUint32(28, crc32(out, { end: 28 }), true);
  return out;
}

/** Why a reader stopped. `end`: clean end of file. */
export type StopReason = "end" | "torn" | "corrupt";

/** Result of scanning a byte range for blocks. */
export interface BlockScan {
  readonly blocks: { readonly header: BlockHeader; readonly offset: number }[];
  /** Bytes covered by valid blocks from the start. */
  readonly validBytes: number;
  readonly stop: StopReason;
  /** Human-readable detail for `torn` or `corrupt`. */
  readonly detail?: string;
}

/** What {@link checkBlockHeader} found: a usable header and its block's size, or why not. */
export type HeaderCheck =
  | { readonly ok: true; readonly header: BlockHeader; readonly size: number }
  | { readonly ok: false; readonly stop: "torn" | "corrupt"; readonly detail: string };

/**
 * Check the block header at `offset` of `bytes` (magic, header CRC, version,
 * shape, step sequence) without reading its payload. `byteLabel` is the
 * header's position as reported in messages (default `offset`).
 */
export function checkBlockHeader(
  bytes: Uint8Array,
  offset: number,
  expect: { walkers: number; columns: number; firstStep: number; byteLabel?: number },
): HeaderCheck {
  const at = expect.byteLabel ?? offset;
  if (bytes.length - offset < BLOCK_HEADER_BYTES) {
    return { ok: false, stop: "torn", detail: `partial header at byte ${at}` };
  }
  const dv = new DataView(bytes.buffer, bytes.byteOffset + offset, BLOCK_HEADER_BYTES);
  const magic = dv.getUint32(0, true);
  const hcrc = dv.getUint32(28, true);
  if (magic !== BLOCK_MAGIC || crc32(bytes, { start: offset, end: offset + 28 }) !== hcrc) {
    return { ok: false, stop: "corrupt", detail: `bad block header at byte ${at}` };
  }
  const version = dv.getUint32(4, true);
  if (version !== BLOCK_VERSION) {
    return { ok: false, stop: "corrupt", detail: `block version ${version} at byte ${at}` };
  }
  const header: BlockHeader = {
    firstStep: dv.getUint32(8, true),
    steps: dv.getUint32(12, true),
    walkers: dv.getUint32(16, true),
    columns: dv.getUint32(20, true),
  };
  if (header.walkers !== expect.walkers || header.columns !== expect.columns) {
    return {
      ok: false,
      stop: "corrupt",
      detail:
        `block at byte ${at} has walkers=${header.walkers}, columns=${header.columns}, expected walkers=${expect.walkers}, columns=${expect.columns}`,
    };
  }
  if (header.firstStep !== expect.firstStep) {
    return {
      ok: false,
      stop: "corrupt",
      detail:
        `block at byte ${at} starts at step ${header.firstStep}, expected ${expect.firstStep}`,
    };
  }
  const size = BLOCK_HEADER_BYTES + 8 * header.steps * header.walkers * header.columns;
  return { ok: true, header, size };
}

/**
 * Scan `bytes` for consecutive valid blocks starting at offset 0. Never
 * throws on bad bytes: it reports where valid data ends and why.
 * `expect` constrains walkers/columns and the step sequence.
 */
export function scanBlocks(
  bytes: Uint8Array,
  expect: { walkers: number; columns: number; firstStep?: number },
): BlockScan {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const blocks: { header: BlockHeader; offset: number }[] = [];
  let off = 0;
  let nextStep = expect.firstStep ?? 0;
  while (off < bytes.length) {
    const check = checkBlockHeader(bytes, off, {
      walkers: expect.walkers,
      columns: expect.columns,
      firstStep: nextStep,
    });
    if (!check.ok) return { blocks, validBytes: off, stop: check.stop, detail: check.detail };
    const { header, size } = check;
    if (off + size > bytes.length) {
      return { blocks, validBytes: off, stop: "torn", detail: `block at byte ${off} is cut short` };
    }
    if (
      crc32(bytes, { start: off + BLOCK_HEADER_BYTES, end: off + size }) !==
        dv.getUint32(off + 24, true)
    ) {
      return {
        blocks,
        validBytes: off,
        stop: "corrupt",
        detail: `payload checksum fails at byte ${off}`,
      };
    }
    blocks.push({ header, offset: off });
    nextStep += header.steps;
    off += size;
  }
  return { blocks, validBytes: off, stop: "end" };
}

/** Copy a block's payload values into `out` at `outOffset`. */
export function readBlockValues(
  bytes: Uint8Array,
  block: { header: BlockHeader; offset: number },
  out: Float64Array,
  outOffset: number,
): void {
  const n = block.header.steps * block.header.walkers * block.header.columns;
  const start = bytes.byteOffset + block.offset + BLOCK_HEADER_BYTES;
  if (start % 8 === 0) {
    out.set(new Float64Array(bytes.buffer, start, n), outOffset);
    return;
  }
  const dv = new DataView(bytes.buffer, start, 8 * n);
  for (let i = 0; i < n; i++) out[outOffset + i] = dv.getFloat64(8 * i, true);
}
