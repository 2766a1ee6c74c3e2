/**
 * Loading a log-density from a module and evaluating it over a range of
 * points; shared by the in-thread evaluator and the workers. Private to
 * `samplers/`.
 * @module
 */

/** A log-density over a parameter vector of exactly D entries. */
export type LogDensity = (theta: Float64Array) => number;

/** Where to find a log-density: the module's export `exportName` is called with `payload`. */
export interface LogDensitySource {
  /** Absolute URL of an ES module (for example `file:///…/model.ts`). */
  moduleUrl: string;
  /** Name of the export: a factory `(payload) => (theta: Float64Array) => number`. */
  exportName: string;
  /** Argument of the factory; must survive structured cloning (sent to workers). */
  payload: unknown;
}

/**
 * Import `source.moduleUrl` and build the log-density with its factory.
 *
 * @throws {TypeError} when the URL is not absolute or the export is not a
 *   factory returning a function.
 */
export async function loadLogDensity(source: LogDensitySource): Promise<LogDensity> {
  if (typeof source !== "object" || source === null) {
    throw new TypeError(
      `Cannot load log-density as the source is not an object: source=${String(source)}`,
    );
  }
  if (typeof source.moduleUrl !== "string" || !URL.canParse(source.moduleUrl)) {
    throw new TypeError(
      `Cannot load log-density as moduleUrl is not an absolute URL: moduleUrl=${
        String(source.moduleUrl)
      }`,
    );
  }
  const mod = (await import(source.moduleUrl)) as Record<string, unknown>;
  const factory = mod[source.exportName];
  if (typeof factory !== "function") {
    throw new TypeError(
      `Cannot load log-density as the export is not a function: moduleUrl=${source.moduleUrl}, exportName=${source.exportName}`,
    );
  }
  const density: unknown = await factory(source.payload);
  if (typeof density !== "function") {
    throw new TypeError(
      `Cannot load log-density as the factory did not return a function: moduleUrl=${source.moduleUrl}, exportName=${source.exportName}`,
    );
  }
  return density as LogDensity;
}

/** Buffers and range of {@linkcode evaluateRange}. */
export interface EvaluationRange {
  /** Points, walker-major (`points[i * D + d]`). */
  points: Float64Array;
  /** Receives the log-densities. */
  out: Float64Array;
  /** Scratch point of length D. */
  theta: Float64Array;
  /** First point. */
  start: number;
  /** One past the last point. */
  end: number;
}

/**
 * out[i] = density(points[i*D .. i*D + D)) for i in [start, end). Each point is
 * copied into `theta` (length D) first, so the density sees exactly D entries
 * and no view is allocated per point.
 */
export function evaluateRange(density: LogDensity, range: EvaluationRange): void {
  const { points, out, theta, start, end } = range;
  const dims = theta.length;
  for (let i = start; i < end; i++) {
    const offset = i * dims;
    for (let d = 0; d < dims; d++) theta[d] = points[offset + d]!;
    out[i] = density(theta);
  }
}

/** First point of chunk `split.index` when `count` points are split into `split.chunks` contiguous chunks. */
export function chunkStart(count: number, split: { chunks: number; index: number }): number {
  return Math.floor((count * split.index) / split.chunks);
}

/** Slots of the shared control array (Int32Array). */
export const Control = {
  /** Generation counter; bumped by the caller to start a task. */
  generation: 0,
  /** Task kind: see `Command`. */
  command: 1,
  /** Number of points in the current task. */
  count: 2,
  /** Number of workers that finished the current task. */
  done: 3,
  /** 1 when a worker failed in the current task. */
  error: 4,
  /** Byte length of the UTF-8 error message in the message buffer. */
  errorLength: 5,
  /** Number of slots. */
  size: 8,
} as const;

/** Task kinds written to `Control.command`. */
export const Command = { evaluate: 1, exit: 2 } as const;

/** Bytes reserved for a worker's error message. */
export const messageBytes = 4096;

/** Message from the caller that starts a worker. */
export interface WorkerInit {
  source: LogDensitySource;
  dimensions: number;
  threads: number;
  /** Chunk index of this worker (1 … threads − 1; the caller takes chunk 0). */
  index: number;
  control: SharedArrayBuffer;
  points: SharedArrayBuffer;
  out: SharedArrayBuffer;
  message: SharedArrayBuffer;
}

/** Messages a worker posts back. */
export type WorkerReply =
  | { kind: "ready" }
  | { kind: "failed"; message: string }
  | { kind: "closed" };
