/**
 * Deliberately wrong log-densities for the power test of the calibration
 * check; imported by the calibration workers through `DensityModule`.
 * @module
 */
import { CompiledModel, type ModelPayload } from "../../src/model/posterior.ts";
import type { DensityModule } from "../../src/calibrate/mod.ts";

/**
 * The model's log-posterior without the log-Jacobian of the first instrument's
 * log-transformed jitter: the sampler works in u = ln s, where the correct
 * density carries + u (|ds/du| = s); dropping it is the classic bug of
 * sampling a transformed parameter as if its prior were written on u. The
 * implied prior on s gains a factor 1/s, pulling the jitter low.
 */
export function createLogPosteriorWithoutJitterJacobian(
  payload: ModelPayload,
): (theta: Float64Array) => number {
  const model = new CompiledModel(payload);
  const j = model.parameters.findIndex((p) => p.key.endsWith(".jitter"));
  if (j < 0 || model.parameters[j]!.transform !== "log") {
    throw new RangeError(`Cannot drop the jitter Jacobian as no log-sampled jitter exists: j=${j}`);
  }
  return (theta) => model.logPosterior(theta) - theta[j]!;
}

/** {@link DensityModule} of {@link createLogPosteriorWithoutJitterJacobian}. */
export const WITHOUT_JITTER_JACOBIAN: DensityModule = {
  moduleUrl: import.meta.url,
  exportName: "createLogPosteriorWithoutJitterJacobian",
};
