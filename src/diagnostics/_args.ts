/**
 * Argument checks shared by the public diagnostics. Private to this folder.
 * @module
 */

import { type ChainView, validateBurn, validateChainView, validateColumn } from "./chain_view.ts";

/** Validate `view`, `column` and `burn` (default 0); return the burn. */
export function checkArgs(view: ChainView, column: number, burn: number | undefined): number {
  validateChainView(view);
  validateColumn(view, column);
  const b = burn ?? 0;
  validateBurn(view, b);
  return b;
}
