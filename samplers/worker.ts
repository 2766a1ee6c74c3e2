/**
 * Entry point of one evaluation worker (a Deno Worker started by
 * `createEvaluator` in `pool.ts`). It loads the log-density, replies "ready",
 * then blocks on the shared control array (Atomics.wait) and evaluates its
 * contiguous chunk of each batch until told to exit.
 * @module
 */

import {
  chunkStart,
  Command,
  Control,
  evaluateRange,
  loadLogDensity,
  messageBytes,
  type WorkerInit,
  type WorkerReply,
} from "./_evaluate.ts";

function reply(message: WorkerReply): void {
  self.postMessage(message);
}

function describe(error: unknown): string {
  return error instanceof Error ? `${error.name}: ${error.message}` : String(error);
}

self.onmessage = async (event: MessageEvent<WorkerInit>) => {
  self.onmessage = null;
  const init = event.data;
  let density;
  try {
    density = await loadLogDensity(init.source);
  } catch (error) {
    reply({ kind: "failed", message: describe(error) });
    return;
  }
  const control = new Int32Array(init.control);
  // Read the generation before replying: the caller may start a task as soon as it hears "ready".
  let seen = Atomics.load(control, Control.generation);
  reply({ kind: "ready" });
  const points = new Float64Array(init.points);
  const out = new Float64Array(init.out);
  const message = new Uint8Array(init.message);
  const theta = new Float64Array(init.dimensions);
  while (true) {
    Atomics.wait(control, Control.generation, seen);
    seen = Atomics.load(control, Control.generation);
    if (Atomics.load(control, Control.command) === Command.exit) break;
    const count = Atomics.load(control, Control.count);
    const start = chunkStart(count, { chunks: init.threads, index: init.index });
    const end = chunkStart(count, { chunks: init.threads, index: init.index + 1 });
    try {
      evaluateRange(density, { points, out, theta, start, end });
    } catch (error) {
      if (Atomics.compareExchange(control, Control.error, 0, 1) === 0) {
        const text = new TextEncoder().encode(`worker ${init.index}: ${describe(error)}`);
        const length = Math.min(text.length, messageBytes);
        message.set(text.subarray(0, length));
        Atomics.store(control, Control.errorLength, length);
      }
    }
    Atomics.add(control, Control.done, 1);
    Atomics.notify(control, Control.done);
  }
  reply({ kind: "closed" });
  self.close();
};
