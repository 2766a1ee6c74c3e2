/**
 * Model kernels: Kepler solver, Keplerian RV, likelihood, priors, transforms.
 * @module
 */
export * from "./kepler.ts";
export * from "./keplerian.ts";
export * from "./likelihood.ts";
export * from "./priors.ts";
export * from "./transforms.ts";
