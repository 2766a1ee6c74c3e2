/**
 * Entry point of one calibration worker (a Deno Worker started by
 * `calibrate`): it receives the problem and the settings once, then runs whole
 * simulations on request, one at a time, with a single-thread evaluator.
 * Private to `src/calibrate/`.
 * @module
 */
import type { ModelPayload } from "../model/posterior.ts";
import { runSimulation, type SimulationResult, type SimulationSettings } from "./simulation.ts";

/** Messages to a worker. */
export type WorkerRequest =
  | { kind: "init"; problem: ModelPayload; settings: SimulationSettings }
  | { kind: "run"; index: number };

/** Messages from a worker. */
export type WorkerResponse =
  | { kind: "result"; result: SimulationResult }
  | { kind: "failed"; index: number; message: string };

let problem: ModelPayload | undefined;
let settings: SimulationSettings | undefined;

self.onmessage = async (event: MessageEvent<WorkerRequest>) => {
  const message = event.data;
  if (message.kind === "init") {
    problem = message.problem;
    settings = message.settings;
    return;
  }
  try {
    if (problem === undefined || settings === undefined) {
      throw new TypeError(
        `Cannot run simulation as the worker has no problem: index=${message.index}`,
      );
    }
    const result = await runSimulation(problem, { ...settings, index: message.index });
    self.postMessage({ kind: "result", result } satisfies WorkerResponse);
  } catch (error) {
    const text = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
    self.postMessage(
      { kind: "failed", index: message.index, message: text } satisfies WorkerResponse,
    );
  }
};
