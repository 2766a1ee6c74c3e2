/**
 * Following a run's chain file as it grows, for watchers: each poll reads only
 * the bytes appended since the last one and feeds whole blocks into streaming
 * diagnostics, so the cost of a refresh does not grow with the run's length.
 * Never writes.
 * @module
 */
import { StreamingDiagnostics } from "../diagnostics/mod.ts";
import { BLOCK_HEADER_BYTES, scanBlocks } from "./chain_block.ts";
import { runPath } from "./layout.ts";

/** Most bytes read per chunk on a first attach to a long run. */
const CHUNK_BYTES = 32 * 1024 * 1024;

/** Reads new blocks of a chain file into a thinned reservoir. */
export class ChainFollower {
  readonly walkers: number;
  readonly columns: number;
  readonly path: string;
  #capacity: number;
  #offset = 0;
  #steps = 0;
  #stream: StreamingDiagnostics;
  /** Set when the valid data stopped at a damaged (not merely torn) block. */
  corruptDetail: string | undefined;

  constructor(dir: string, shape: { walkers: number; columns: number; capacity?: number }) {
    this.walkers = shape.walkers;
    this.columns = shape.columns;
    this.path = runPath(dir, "chain");
    this.#capacity = shape.capacity ?? 1024;
    this.#stream = this.#newStream();
  }

  #newStream(): StreamingDiagnostics {
    return new StreamingDiagnostics(this.walkers, this.columns, {
      capacity: this.#capacity,
      acceptedColumn: 1,
    });
  }

  /** Steps read so far. */
  get steps(): number {
    return this.#steps;
  }

  /** The streaming diagnostics over what has been read. */
  get stream(): StreamingDiagnostics {
    return this.#stream;
  }

  /** Read whatever was appended since the last poll; returns the number of new steps. */
  async poll(): Promise<number> {
    let size: number;
    try {
      size = (await Deno.stat(this.path)).size;
    } catch {
      return 0;
    }
    if (size < this.#offset) {
      // The writer truncated past our position (a resume dropped an unflushed tail): start over.
      this.#offset = 0;
      this.#steps = 0;
      this.#stream = this.#newStream();
    }
    if (size - this.#offset < BLOCK_HEADER_BYTES) return 0;
    const f = await Deno.open(this.path, { read: true });
    let added = 0;
    try {
      while (size - this.#offset >= BLOCK_HEADER_BYTES) {
        const want = Math.min(size - this.#offset, CHUNK_BYTES);
        const buf = new Uint8Array(want);
        await f.seek(this.#offset, Deno.SeekMode.Start);
        let got = 0;
        while (got < want) {
          const n = await f.read(buf.subarray(got));
          if (n === null) break;
          got += n;
        }
        const scan = scanBlocks(buf.subarray(0, got), {
          walkers: this.walkers,
          columns: this.columns,
          firstStep: this.#steps,
        });
        if (scan.blocks.length === 0) {
          // A block larger than the chunk: read it whole.
          if (scan.stop === "torn" && got === CHUNK_BYTES) {
            const dv = new DataView(buf.buffer);
            const need = BLOCK_HEADER_BYTES +
              8 * dv.getUint32(12, true) * this.walkers * this.columns;
            if (need > got && this.#offset + need <= size) {
              const whole = new Uint8Array(need);
              await f.seek(this.#offset, Deno.SeekMode.Start);
              let g = 0;
              while (g < need) {
                const n = await f.read(whole.subarray(g));
                if (n === null) break;
                g += n;
              }
              added += this.#ingest(
                whole,
                scanBlocks(whole, {
                  walkers: this.walkers,
                  columns: this.columns,
                  firstStep: this.#steps,
                }),
              );
              continue;
            }
          }
          if (scan.stop === "corrupt") this.corruptDetail = scan.detail;
          break;
        }
        added += this.#ingest(buf, scan);
        if (scan.stop === "corrupt") {
          this.corruptDetail = scan.detail;
          break;
        }
        if (got < want) break;
      }
    } finally {
      f.close();
    }
    return added;
  }

  #ingest(buf: Uint8Array, scan: ReturnType<typeof scanBlocks>): number {
    let added = 0;
    for (const b of scan.blocks) {
      const n = b.header.steps * this.walkers * this.columns;
      const start = buf.byteOffset + b.offset + BLOCK_HEADER_BYTES;
      const data = start % 8 === 0 ? new Float64Array(buf.buffer, start, n) : new Float64Array(
        buf.slice(b.offset + BLOCK_HEADER_BYTES, b.offset + BLOCK_HEADER_BYTES + 8 * n).buffer,
      );
      this.#stream.push({
        data,
        steps: b.header.steps,
        walkers: this.walkers,
        columns: this.columns,
      });
      this.#steps += b.header.steps;
      added += b.header.steps;
    }
    this.#offset += scan.validBytes;
    return added;
  }
}
