/**
 * Appending blocks to a run's chain file and reading it back.
 * Readers never write and stop quietly at a torn last block.
 * @module
 */
import { InputError } from "../errors.ts";
import {
  BLOCK_HEADER_BYTES,
  type BlockHeader,
  checkBlockHeader,
  encodeBlock,
  scanBlocks,
} from "./chain_block.ts";
import { runPath } from "./layout.ts";

/** Samples as `[step][walker][column]`, value = data[(s·walkers + w)·columns + c]. */
export interface ChainData {
  readonly data: Float64Array;
  readonly steps: number;
  readonly walkers: number;
  readonly columns: number;
}

/** Append one encoded block and fsync; returns the new file length. */
export async function appendBlock(
  dir: string,
  header: BlockHeader,
  values: Float64Array,
): Promise<number> {
  const bytes = encodeBlock(header, values);
  const f = await Deno.open(runPath(dir, "chain"), { append: true, create: true });
  try {
    let off = 0;
    while (off < bytes.length) off += await f.write(bytes.subarray(off));
    await f.sync();
    return (await f.stat()).size;
  } finally {
    f.close();
  }
}

/** Cut the chain file back to `bytes` (resume drops blocks past the checkpoint). */
export async function truncateChain(dir: string, bytes: number): Promise<void> {
  const path = runPath(dir, "chain");
  try {
    const size = (await Deno.stat(path)).size;
    if (size > bytes) await Deno.truncate(path, bytes);
  } catch (err) {
    if (!(err instanceof Deno.errors.NotFound) || bytes > 0) throw err;
  }
}

/** What a read found. */
export interface ChainRead {
  readonly chain: ChainData;
  /** Total steps held by valid blocks (before thinning). */
  readonly stepsOnDisk: number;
  /** Step index of the first kept step and the thinning used. */
  readonly firstStep: number;
  readonly thin: number;
  readonly stop: "end" | "torn" | "corrupt";
  readonly detail?: string;
  readonly validBytes: number;
}

/**
 * Read the chain, keeping steps `from, from+thin, …` (steps counted from 0).
 * Reads block by block, so memory is bounded by the kept samples plus one block.
 */
export async function readChain(
  dir: string,
  shape: { walkers: number; columns: number },
  options: { from?: number; thin?: number; path?: string } = {},
): Promise<ChainRead> {
  const path = options.path ?? runPath(dir, "chain");
  const thin = Math.max(1, Math.floor(options.thin ?? 1));
  const from = Math.max(0, Math.floor(options.from ?? 0));
  const { walkers, columns } = shape;
  const rowLen = walkers * columns;
  let file: Deno.FsFile;
  let fileSize: number;
  try {
    file = await Deno.open(path, { read: true });
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) {
      return {
        chain: { data: new Float64Array(0), steps: 0, walkers, columns },
        stepsOnDisk: 0,
        firstStep: from,
        thin,
        stop: "end",
        validBytes: 0,
      };
    }
    throw new InputError(`cannot read chain file: ${firstLine(err)}`, { file: path });
  }
  const chunks: Float64Array[] = [];
  let kept = 0;
  let off = 0;
  let step = 0;
  let stop: ChainRead["stop"] = "end";
  let detail: string | undefined;
  try {
    try {
      const info = await file.stat();
      if (!info.isFile) throw new Error("not a regular file");
      fileSize = info.size;
    } catch (err) {
      throw new InputError(`cannot read chain file: ${firstLine(err)}`, { file: path });
    }
    const head = new Uint8Array(BLOCK_HEADER_BYTES);
    while (true) {
      const got = await readFull(file, head);
      if (got === 0) break;
      const check = checkBlockHeader(head.subarray(0, got), 0, {
        walkers,
        columns,
        firstStep: step,
        byteLabel: off,
      });
      if (!check.ok) {
        stop = check.stop;
        detail = check.detail;
        break;
      }
      // The header is valid, so its size is what the writer meant; a block past
      // the end of the file is a write cut short. Nothing is allocated for it.
      if (off + check.size > fileSize) {
        stop = "torn";
        detail = `block at byte ${off} is cut short: needs ${check.size} bytes, ${
          fileSize - off
        } on disk`;
        break;
      }
      const { steps } = check.header;
      const payloadBytes = check.size - BLOCK_HEADER_BYTES;
      const whole = new Uint8Array(check.size);
      whole.set(head);
      const n = await readFull(file, whole.subarray(BLOCK_HEADER_BYTES));
      if (n < payloadBytes) {
        stop = "torn";
        detail = `block at byte ${off} is cut short`;
        break;
      }
      const scan = scanBlocks(whole, { walkers, columns, firstStep: step });
      if (scan.blocks.length !== 1) {
        stop = scan.stop;
        detail = scan.detail?.replace(/byte \d+/, `byte ${off}`);
        break;
      }
      const values = new Float64Array(whole.buffer, BLOCK_HEADER_BYTES, payloadBytes / 8);
      for (let s = 0; s < steps; s++) {
        const g = step + s;
        if (g >= from && (g - from) % thin === 0) {
          chunks.push(values.slice(s * rowLen, (s + 1) * rowLen));
          kept++;
        }
      }
      step += steps;
      off += whole.length;
    }
  } finally {
    file.close();
  }
  const data = new Float64Array(kept * rowLen);
  chunks.forEach((c, i) => data.set(c, i * rowLen));
  return {
    chain: { data, steps: kept, walkers, columns },
    stepsOnDisk: step,
    firstStep: from,
    thin,
    stop,
    detail,
    validBytes: off,
  };
}

async function readFull(f: Deno.FsFile, buf: Uint8Array): Promise<number> {
  let off = 0;
  while (off < buf.length) {
    const n = await f.read(buf.subarray(off));
    if (n === null) break;
    off += n;
  }
  return off;
}

function firstLine(err: unknown): string {
  return String((err as Error)?.message ?? err).split("\n")[0]!;
}
