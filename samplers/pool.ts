/**
 * Evaluators: compute log-densities for a batch of points, in the calling
 * thread or split over Deno Workers that share the batch through
 * SharedArrayBuffer.
 *
 * Signalling: workers block in `Atomics.wait` on a shared control array and
 * the caller wakes them with `Atomics.notify`, evaluates chunk 0 itself, then
 * blocks in `Atomics.wait` until every worker has counted itself done.
 * Measured on the 2-core development machine (Deno 2.9.6, busy with other
 * jobs): a bare worker round trip took about 23 µs with Atomics on both sides,
 * 30 µs with an Atomics wake-up and a postMessage reply, and 46 µs with
 * postMessage both ways (means over 20 000 round trips), so Atomics is used;
 * through this evaluator a batch of two trivial points then costs about
 * 8–15 µs with 2 threads against under 1 µs in one thread. Because the caller
 * blocks while the workers finish its batch, timers and I/O of the calling
 * thread wait for the batch too.
 *
 * Every point is evaluated by the same function on its own copy of the point,
 * so the results do not depend on the number of threads (provided the
 * log-density is a pure function of theta).
 * @module
 */

import {
  chunkStart,
  Command,
  Control,
  evaluateRange,
  loadLogDensity,
  type LogDensity,
  type LogDensitySource,
  messageBytes,
  type WorkerInit,
  type WorkerReply,
} from "./_evaluate.ts";

export type { LogDensity, LogDensitySource } from "./_evaluate.ts";

/** Computes log-densities for batches of points. */
export interface Evaluator {
  /** Number of parameters D of each point. */
  readonly dimensions: number;
  /**
   * out[i] = log-density of point i, for the `count` points stored
   * walker-major in `points` (`points[i * D + d]`).
   */
  evaluate(points: Float64Array, count: number, out: Float64Array): Promise<void>;
  /** Release the workers (idempotent). */
  close(): Promise<void> | void;
}

/** Options of {@linkcode createEvaluator}. */
export interface EvaluatorOptions {
  /** Threads evaluating a batch: 1 = the calling thread only; N > 1 = the calling thread plus N − 1 workers. */
  threads: number;
  /** Number of parameters D. */
  dimensions: number;
  /** Points held by the shared buffers; larger batches go through in several rounds. @default 1024 */
  capacity?: number;
}

/**
 * Create an evaluator for the log-density described by `source`.
 *
 * @throws {RangeError} when threads, dimensions or capacity are not positive integers.
 * @throws {TypeError} when the source cannot be loaded (also when a worker fails to load it).
 */
export async function createEvaluator(
  source: LogDensitySource,
  options: EvaluatorOptions,
): Promise<Evaluator> {
  const { threads, dimensions } = options;
  const capacity = options.capacity ?? 1024;
  for (
    const [name, value] of [["threads", threads], ["dimensions", dimensions], [
      "capacity",
      capacity,
    ]] as const
  ) {
    if (!Number.isInteger(value) || value < 1) {
      throw new RangeError(
        `Cannot create evaluator as ${name} must be a positive integer: ${name}=${value}`,
      );
    }
  }
  const density = await loadLogDensity(source);
  if (threads === 1) return new LocalEvaluator(density, dimensions);
  return await WorkerEvaluator.start(source, density, { threads, dimensions, capacity });
}

function checkBatch(
  dimensions: number,
  points: Float64Array,
  count: number,
  out: Float64Array,
): void {
  if (
    !Number.isInteger(count) || count < 0 || points.length < count * dimensions ||
    out.length < count
  ) {
    throw new RangeError(
      `Cannot evaluate batch as the buffers are too short: count=${count}, dimensions=${dimensions}, points.length=${points.length}, out.length=${out.length}`,
    );
  }
}

class LocalEvaluator implements Evaluator {
  readonly dimensions: number;
  #density: LogDensity;
  #theta: Float64Array;

  constructor(density: LogDensity, dimensions: number) {
    this.dimensions = dimensions;
    this.#density = density;
    this.#theta = new Float64Array(dimensions);
  }

  evaluate(points: Float64Array, count: number, out: Float64Array): Promise<void> {
    try {
      checkBatch(this.dimensions, points, count, out);
      evaluateRange(this.#density, { points, out, theta: this.#theta, start: 0, end: count });
      return Promise.resolve();
    } catch (error) {
      return Promise.reject(error);
    }
  }

  close(): void {}
}

class WorkerEvaluator implements Evaluator {
  readonly dimensions: number;
  #density: LogDensity;
  #threads: number;
  #capacity: number;
  #workers: Worker[];
  #closed: Promise<void>[];
  #control: Int32Array;
  #points: Float64Array;
  #out: Float64Array;
  #message: Uint8Array;
  #theta: Float64Array;
  #isClosed = false;

  private constructor(
    density: LogDensity,
    options: { threads: number; dimensions: number; capacity: number },
  ) {
    this.dimensions = options.dimensions;
    this.#density = density;
    this.#threads = options.threads;
    this.#capacity = options.capacity;
    this.#workers = [];
    this.#closed = [];
    this.#control = new Int32Array(new SharedArrayBuffer(Control.size * 4));
    this.#points = new Float64Array(
      new SharedArrayBuffer(options.capacity * options.dimensions * 8),
    );
    this.#out = new Float64Array(new SharedArrayBuffer(options.capacity * 8));
    this.#message = new Uint8Array(new SharedArrayBuffer(messageBytes));
    this.#theta = new Float64Array(options.dimensions);
  }

  static async start(
    source: LogDensitySource,
    density: LogDensity,
    options: { threads: number; dimensions: number; capacity: number },
  ): Promise<WorkerEvaluator> {
    const pool = new WorkerEvaluator(density, options);
    const ready: Promise<void>[] = [];
    for (let index = 1; index < options.threads; index++) {
      const worker = new Worker(new URL("./worker.ts", import.meta.url), { type: "module" });
      pool.#workers.push(worker);
      let onClosed: () => void = () => {};
      pool.#closed.push(new Promise<void>((resolve) => (onClosed = resolve)));
      ready.push(
        new Promise<void>((resolve, reject) => {
          worker.onmessage = (event: MessageEvent<WorkerReply>) => {
            const reply = event.data;
            if (reply.kind === "ready") resolve();
            else if (reply.kind === "failed") {
              onClosed();
              reject(
                new TypeError(
                  `Cannot start evaluation worker as it failed to load the log-density: ${reply.message}`,
                ),
              );
            } else onClosed();
          };
          worker.onerror = (event: ErrorEvent) => {
            event.preventDefault();
            reject(
              new TypeError(
                `Cannot start evaluation worker as it raised an error: ${event.message}`,
              ),
            );
            onClosed();
          };
        }),
      );
      const init: WorkerInit = {
        source,
        dimensions: options.dimensions,
        threads: options.threads,
        index,
        control: pool.#control.buffer as SharedArrayBuffer,
        points: pool.#points.buffer as SharedArrayBuffer,
        out: pool.#out.buffer as SharedArrayBuffer,
        message: pool.#message.buffer as SharedArrayBuffer,
      };
      worker.postMessage(init);
    }
    try {
      await Promise.all(ready);
    } catch (error) {
      await pool.close();
      throw error;
    }
    return pool;
  }

  evaluate(points: Float64Array, count: number, out: Float64Array): Promise<void> {
    try {
      if (this.#isClosed) {
        throw new RangeError(
          `Cannot evaluate batch as the evaluator is closed: threads=${this.#threads}`,
        );
      }
      checkBatch(this.dimensions, points, count, out);
      for (let first = 0; first < count; first += this.#capacity) {
        const size = Math.min(this.#capacity, count - first);
        this.#evaluateBatch(points, first, size, out);
      }
      return Promise.resolve();
    } catch (error) {
      return Promise.reject(error);
    }
  }

  #evaluateBatch(points: Float64Array, first: number, size: number, out: Float64Array): void {
    const dims = this.dimensions;
    const control = this.#control;
    const workers = this.#workers.length;
    this.#points.set(points.subarray(first * dims, (first + size) * dims));
    Atomics.store(control, Control.count, size);
    Atomics.store(control, Control.done, 0);
    Atomics.store(control, Control.error, 0);
    Atomics.store(control, Control.command, Command.evaluate);
    Atomics.add(control, Control.generation, 1);
    Atomics.notify(control, Control.generation);
    let ownError: unknown = null;
    try {
      evaluateRange(this.#density, {
        points: this.#points,
        out: this.#out,
        theta: this.#theta,
        start: 0,
        end: chunkStart(size, { chunks: this.#threads, index: 1 }),
      });
    } catch (error) {
      ownError = error;
    }
    for (
      let done = Atomics.load(control, Control.done);
      done < workers;
      done = Atomics.load(control, Control.done)
    ) {
      Atomics.wait(control, Control.done, done);
    }
    if (ownError !== null) throw ownError;
    if (Atomics.load(control, Control.error) !== 0) {
      const length = Atomics.load(control, Control.errorLength);
      const text = new TextDecoder().decode(this.#message.slice(0, length));
      throw new Error(`Cannot evaluate batch as a log-density evaluation failed in ${text}`);
    }
    out.set(this.#out.subarray(0, size), first);
  }

  async close(): Promise<void> {
    if (this.#isClosed) return;
    this.#isClosed = true;
    Atomics.store(this.#control, Control.command, Command.exit);
    Atomics.add(this.#control, Control.generation, 1);
    Atomics.notify(this.#control, Control.generation);
    let timer: ReturnType<typeof setTimeout> | undefined;
    const timeout = new Promise<void>((resolve) => (timer = setTimeout(resolve, 2000)));
    await Promise.race([Promise.all(this.#closed), timeout]);
    clearTimeout(timer);
    for (const worker of this.#workers) worker.terminate();
  }
}
