/**
 * The chain layout shared across rvwalk, and its boundary checks.
 * @module
 */

/**
 * A chain stored step-major: value(step s, walker w, column c) is
 * `data[(s * walkers + w) * columns + c]`. Each walker's trace is one chain
 * for R-hat and ESS; merged runs are simply more walkers.
 */
export interface ChainView {
  /** Values, `steps * walkers * columns` long. */
  data: Float64Array;
  /** Number of steps stored. */
  steps: number;
  /** Number of walkers (chains). */
  walkers: number;
  /** Number of columns per walker and step (parameters, log-posterior, flags...). */
  columns: number;
}

function isCount(x: number): boolean {
  return Number.isInteger(x) && x >= 0;
}

/**
 * Check that `view` is a well-formed chain.
 * @throws {TypeError} when the shape fields are not non-negative integers or
 * the data length does not match them.
 */
export function validateChainView(view: ChainView): void {
  if (!(view.data instanceof Float64Array)) {
    throw new TypeError("Cannot read chain as data is not a Float64Array");
  }
  if (!isCount(view.steps) || !isCount(view.walkers) || !isCount(view.columns)) {
    throw new TypeError(
      `Cannot read chain as its shape is not made of non-negative integers: steps=${view.steps}, walkers=${view.walkers}, columns=${view.columns}`,
    );
  }
  const expected = view.steps * view.walkers * view.columns;
  if (view.data.length !== expected) {
    throw new TypeError(
      `Cannot read chain as data length does not match its shape: length=${view.data.length}, steps=${view.steps}, walkers=${view.walkers}, columns=${view.columns}`,
    );
  }
}

/**
 * Check a column index against `view`.
 * @throws {RangeError} when `column` is not an integer in `[0, columns)`.
 */
export function validateColumn(view: ChainView, column: number): void {
  if (!Number.isInteger(column) || column < 0 || column >= view.columns) {
    throw new RangeError(
      `Cannot read column as it is outside the chain: column=${column}, columns=${view.columns}`,
    );
  }
}

/**
 * Check a burn-in length against `view`.
 * @throws {RangeError} when `burn` is not an integer in `[0, steps]`.
 */
export function validateBurn(view: ChainView, burn: number): void {
  if (!Number.isInteger(burn) || burn < 0 || burn > view.steps) {
    throw new RangeError(
      `Cannot discard burn-in as it is not a step count within the chain: burn=${burn}, steps=${view.steps}`,
    );
  }
}
