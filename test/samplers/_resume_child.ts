/**
 * Child process of the resume test: reads a JSON file naming a serialized
 * ensemble state, a log-density source, moves, threads and a step count;
 * takes the steps and prints the serialized state after each step as JSON.
 * Usage: deno run -A test/samplers/_resume_child.ts <input.json>
 * @module
 */

import {
  createEvaluator,
  deserializeState,
  type LogDensitySource,
  type MoveMix,
  serializeState,
  step,
} from "../../samplers/mod.ts";

const path = Deno.args[0];
if (path === undefined) throw new TypeError("Cannot resume as no input file was given: args=0");
const input = JSON.parse(await Deno.readTextFile(path)) as {
  state: unknown;
  source: LogDensitySource;
  moves: MoveMix;
  threads: number;
  steps: number;
};
let state = deserializeState(input.state);
const evaluator = await createEvaluator(input.source, {
  threads: input.threads,
  dimensions: state.dimensions,
});
const states = [];
for (let s = 0; s < input.steps; s++) {
  ({ state } = await step(state, { evaluator, moves: input.moves }));
  states.push(serializeState(state));
}
await evaluator.close();
console.log(JSON.stringify(states));
