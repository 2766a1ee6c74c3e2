/**
 * The dashboard's view-model and its pure reducer. `reduce(model, event)`
 * folds run snapshots, key presses and terminal resizes into a plain state;
 * `buildScreen` in `screen.ts` turns that state into display-ready lines.
 * @module
 */

import type { RunSnapshot } from "./snapshot.ts";
import { displayRange, sortedFinite, summarizeSorted, type Summary } from "./stats.ts";

/** The dashboard's views, in tab order. */
export const VIEWS = ["convergence", "posterior", "pair", "trace", "planets"] as const;

/** One of {@link VIEWS}. */
export type ViewName = typeof VIEWS[number];

/** Short tab labels, same order as {@link VIEWS}. */
export const VIEW_LABELS: Readonly<Record<ViewName, string>> = {
  convergence: "convergence",
  posterior: "posterior",
  pair: "pair",
  trace: "trace",
  planets: "planets",
};

/** A key press after mapping from the terminal (see {@link keyFromInput}). */
export type DashboardKey =
  | { readonly kind: "view"; readonly view: ViewName }
  | {
    readonly kind:
      | "nextView"
      | "prevView"
      | "up"
      | "down"
      | "pageUp"
      | "pageDown"
      | "first"
      | "last"
      | "nextX"
      | "prevX"
      | "nextY"
      | "prevY"
      | "swapPair"
      | "pairFromSelection"
      | "toggleDots"
      | "toggleHelp"
      | "closeHelp"
      | "quit";
  };

/** Everything the reducer reacts to. */
export type DashboardEvent =
  | { readonly type: "snapshot"; readonly snapshot: RunSnapshot }
  | { readonly type: "key"; readonly key: DashboardKey }
  | { readonly type: "resize"; readonly columns: number; readonly rows: number }
  | { readonly type: "loadError"; readonly message: string };

/** Sorted draws and summary of one quantity, computed once per snapshot. */
export interface QuantityStats {
  /** Finite draws, ascending. */
  readonly sorted: Float64Array;
  readonly summary: Summary;
  /** Range the histogram spans (0.5% to 99.5% quantile). */
  readonly range: readonly [number, number];
}

/** One sampled parameter with its statistics. */
export interface ParameterStats extends QuantityStats {
  readonly key: string;
  readonly unit: string;
}

/** A planet's derived quantities with their statistics. */
export interface PlanetStats {
  readonly name: string;
  readonly msiniMjup: QuantityStats;
  readonly msiniMearth: QuantityStats;
  readonly aAu: QuantityStats;
  readonly eccentricity: QuantityStats;
  readonly lambdaDeg?: QuantityStats;
  readonly psiDeg?: QuantityStats;
}

/** The dashboard state: what is shown, where the cursor is, and the latest data. */
export interface ViewModel {
  /** Terminal width in cells. */
  readonly columns: number;
  /** Terminal height in rows. */
  readonly rows: number;
  /** Whether colour may be used (false under NO_COLOR). */
  readonly color: boolean;
  readonly view: ViewName;
  /** Whether the help overlay replaces the view body. */
  readonly help: boolean;
  /** Selected parameter (index into `parameters`). */
  readonly selected: number;
  /** First planet shown in the planets view. */
  readonly planet: number;
  /** Parameter on the x axis of the pair view. */
  readonly pairX: number;
  /** Parameter on the y axis of the pair view. */
  readonly pairY: number;
  /** Pair view drawing: shaded density regions, or braille dots of every occupied pixel. */
  readonly pairStyle: "shade" | "dots";
  /** Set once `q` was pressed. */
  readonly quit: boolean;
  /** Latest snapshot, if any arrived. */
  readonly snapshot?: RunSnapshot;
  /** Statistics of the latest snapshot's draws, same order as its parameters. */
  readonly parameters: readonly ParameterStats[];
  readonly planets: readonly PlanetStats[];
  /** Last error reading the run directory, cleared by the next snapshot. */
  readonly loadError?: string;
  /** Number of snapshots reduced so far. */
  readonly updates: number;
}

/** Options of {@link initialModel}. */
export interface InitialModelOptions {
  /** @default 80 */
  readonly columns?: number;
  /** @default 24 */
  readonly rows?: number;
  /** @default true */
  readonly color?: boolean;
  /** @default "convergence" */
  readonly view?: ViewName;
}

/** Smallest terminal the layout is computed for; smaller terminals get clipped lines. */
const MIN_COLUMNS = 20;
const MIN_ROWS = 8;

/** The state before any snapshot arrived. */
export function initialModel(options: InitialModelOptions = {}): ViewModel {
  return {
    columns: clampSize(options.columns ?? 80, MIN_COLUMNS),
    rows: clampSize(options.rows ?? 24, MIN_ROWS),
    color: options.color ?? true,
    view: options.view ?? "convergence",
    help: false,
    selected: 0,
    planet: 0,
    pairX: 0,
    pairY: 1,
    pairStyle: "shade",
    quit: false,
    parameters: [],
    planets: [],
    updates: 0,
  };
}

function clampSize(n: number, min: number): number {
  return Number.isFinite(n) ? Math.max(min, Math.floor(n)) : min;
}

/** Sorted draws, median, 68% interval and plot range of one set of draws. */
export function quantityStats(draws: ArrayLike<number>): QuantityStats {
  const sorted = sortedFinite(draws);
  return { sorted, summary: summarizeSorted(sorted), range: displayRange(sorted) };
}

/** Rows a list view moves on page up/down. */
const PAGE = 10;

/** Fold one event into the model. Pure: returns a new model, never mutates. */
export function reduce(model: ViewModel, event: DashboardEvent): ViewModel {
  switch (event.type) {
    case "snapshot":
      return withSnapshot(model, event.snapshot);
    case "resize":
      return {
        ...model,
        columns: clampSize(event.columns, MIN_COLUMNS),
        rows: clampSize(event.rows, MIN_ROWS),
      };
    case "loadError":
      return { ...model, loadError: event.message };
    case "key":
      return withKey(model, event.key);
  }
}

function withSnapshot(model: ViewModel, snapshot: RunSnapshot): ViewModel {
  const parameters = snapshot.parameters.map((p, i): ParameterStats => ({
    key: p.key,
    unit: p.unit,
    ...quantityStats(snapshot.draws[i] ?? new Float64Array(0)),
  }));
  const planets = snapshot.planets.map((p): PlanetStats => ({
    name: p.name,
    msiniMjup: quantityStats(p.msiniMjup),
    msiniMearth: quantityStats(p.msiniMearth),
    aAu: quantityStats(p.aAu),
    eccentricity: quantityStats(p.eccentricity),
    ...(p.lambdaDeg ? { lambdaDeg: quantityStats(p.lambdaDeg) } : {}),
    ...(p.psiDeg ? { psiDeg: quantityStats(p.psiDeg) } : {}),
  }));
  const n = parameters.length;
  const firstSnapshot = model.snapshot === undefined;
  const { loadError: _dropped, ...rest } = model;
  return {
    ...rest,
    snapshot,
    parameters,
    planets,
    updates: model.updates + 1,
    selected: clampIndex(model.selected, n),
    planet: clampIndex(model.planet, planets.length),
    pairX: clampIndex(firstSnapshot ? 0 : model.pairX, n),
    pairY: clampIndex(firstSnapshot ? Math.min(1, n - 1) : model.pairY, n),
  };
}

function clampIndex(i: number, n: number): number {
  return n <= 0 ? 0 : Math.min(n - 1, Math.max(0, i));
}

function cycle(i: number, delta: number, n: number): number {
  return n <= 0 ? 0 : (((i + delta) % n) + n) % n;
}

function withKey(model: ViewModel, key: DashboardKey): ViewModel {
  const n = model.parameters.length;
  const viewIndex = VIEWS.indexOf(model.view);
  const onPlanets = model.view === "planets";
  const move = (delta: number): ViewModel =>
    onPlanets
      ? { ...model, planet: clampIndex(model.planet + delta, model.planets.length) }
      : { ...model, selected: clampIndex(model.selected + delta, n) };
  switch (key.kind) {
    case "view":
      return { ...model, view: key.view, help: false };
    case "nextView":
      return { ...model, view: VIEWS[cycle(viewIndex, 1, VIEWS.length)]!, help: false };
    case "prevView":
      return { ...model, view: VIEWS[cycle(viewIndex, -1, VIEWS.length)]!, help: false };
    case "up":
      return move(-1);
    case "down":
      return move(1);
    case "pageUp":
      return move(-PAGE);
    case "pageDown":
      return move(PAGE);
    case "first":
      return move(-Infinity);
    case "last":
      return move(Infinity);
    case "nextX":
      return { ...model, pairX: cycle(model.pairX, 1, n) };
    case "prevX":
      return { ...model, pairX: cycle(model.pairX, -1, n) };
    case "nextY":
      return { ...model, pairY: cycle(model.pairY, 1, n) };
    case "prevY":
      return { ...model, pairY: cycle(model.pairY, -1, n) };
    case "swapPair":
      return { ...model, pairX: model.pairY, pairY: model.pairX };
    case "pairFromSelection":
      return { ...model, pairX: model.selected, view: "pair", help: false };
    case "toggleDots":
      return { ...model, pairStyle: model.pairStyle === "shade" ? "dots" : "shade" };
    case "toggleHelp":
      return { ...model, help: !model.help };
    case "closeHelp":
      return { ...model, help: false };
    case "quit":
      return { ...model, quit: true };
  }
}

/** The subset of Ink's key flags the dashboard reads. */
export interface TerminalKey {
  readonly upArrow?: boolean;
  readonly downArrow?: boolean;
  readonly leftArrow?: boolean;
  readonly rightArrow?: boolean;
  readonly pageUp?: boolean;
  readonly pageDown?: boolean;
  readonly home?: boolean;
  readonly end?: boolean;
  readonly tab?: boolean;
  readonly shift?: boolean;
  readonly escape?: boolean;
  readonly ctrl?: boolean;
  readonly meta?: boolean;
}

/**
 * Map a terminal key press (Ink's `useInput` arguments) to a dashboard key,
 * or undefined when the key means nothing here.
 *
 * Keys: 1..5 pick a view, tab / shift-tab or → / ← cycle views; ↑/↓ or k/j
 * move the selection, PgUp/PgDn by ten, g/G or Home/End to the ends; x/X and
 * y/Y cycle the pair's x and y parameter, s swaps them, p puts the selected
 * parameter on x and opens the pair view, d toggles dots/shading there;
 * ? toggles help, Esc closes it, q quits.
 */
export function keyFromInput(input: string, key: TerminalKey): DashboardKey | undefined {
  if (key.ctrl || key.meta) return undefined;
  if (key.tab) return { kind: key.shift ? "prevView" : "nextView" };
  if (key.rightArrow) return { kind: "nextView" };
  if (key.leftArrow) return { kind: "prevView" };
  if (key.upArrow) return { kind: "up" };
  if (key.downArrow) return { kind: "down" };
  if (key.pageUp) return { kind: "pageUp" };
  if (key.pageDown) return { kind: "pageDown" };
  if (key.home) return { kind: "first" };
  if (key.end) return { kind: "last" };
  if (key.escape) return { kind: "closeHelp" };
  const digit = /^[1-9]$/.test(input) ? Number(input) - 1 : -1;
  const view = VIEWS[digit];
  if (view) return { kind: "view", view };
  const byChar: Readonly<Record<string, DashboardKey["kind"]>> = {
    k: "up",
    j: "down",
    g: "first",
    G: "last",
    x: "nextX",
    X: "prevX",
    y: "nextY",
    Y: "prevY",
    s: "swapPair",
    p: "pairFromSelection",
    d: "toggleDots",
    "?": "toggleHelp",
    q: "quit",
  };
  const kind = byChar[input];
  return kind ? { kind } as DashboardKey : undefined;
}

/**
 * Like {@link keyFromInput}, for input that may carry several characters at
 * once (keys typed faster than the terminal is read, or pasted): each plain
 * character becomes its own key, in order; unknown characters are skipped.
 */
export function keysFromInput(input: string, key: TerminalKey): DashboardKey[] {
  const chars = Array.from(input);
  if (chars.length <= 1) {
    const k = keyFromInput(input, key);
    return k ? [k] : [];
  }
  if (key.ctrl || key.meta) return [];
  return chars.flatMap((c) => {
    const k = keyFromInput(c, {});
    return k ? [k] : [];
  });
}
