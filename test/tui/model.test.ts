import { describe, expect, test } from "vitest";
import {
  type DashboardKey,
  initialModel,
  keyFromInput,
  keysFromInput,
  reduce,
  type ViewModel,
} from "../../tui/model.ts";
import { convergedSnapshot, FIXTURE_DRAWS, PARAMETER_INDEX } from "./_fixtures.ts";

const key = (k: DashboardKey) => ({ type: "key", key: k }) as const;
const press = (m: ViewModel, ...kinds: DashboardKey["kind"][]) =>
  kinds.reduce((acc, kind) => reduce(acc, key({ kind } as DashboardKey)), m);

function loaded(): ViewModel {
  return reduce(initialModel({ columns: 80, rows: 24, color: false }), {
    type: "snapshot",
    snapshot: convergedSnapshot(),
  });
}

describe("reduce", () => {
  test("reduce() turns a snapshot into sorted draws and medians", () => {
    const snap = convergedSnapshot();
    const m = loaded();
    expect(m.updates).toBe(1);
    expect(m.parameters.map((p) => p.key)).toEqual(snap.parameters.map((p) => p.key));
    const i = PARAMETER_INDEX["b.semiAmplitude"]!;
    // Independent median: average of the two middle order statistics (n even).
    const sorted = Array.from(snap.draws[i]!).sort((a, b) => a - b);
    const expected = (sorted[FIXTURE_DRAWS / 2 - 1]! + sorted[FIXTURE_DRAWS / 2]!) / 2;
    expect(m.parameters[i]!.summary.median).toBeCloseTo(expected, 12);
    expect(m.planets.map((p) => p.name)).toEqual(["b", "c"]);
    expect(m.planets[0]!.lambdaDeg).toBeDefined();
    expect(m.planets[1]!.lambdaDeg).toBeUndefined();
    expect(m.pairX).toBe(0);
    expect(m.pairY).toBe(1);
  });

  test("reduce() switches views by number and cycles with tab", () => {
    let m = loaded();
    m = reduce(m, key({ kind: "view", view: "trace" }));
    expect(m.view).toBe("trace");
    m = press(m, "nextView");
    expect(m.view).toBe("planets");
    m = press(m, "nextView");
    expect(m.view).toBe("convergence");
    m = press(m, "prevView");
    expect(m.view).toBe("planets");
  });

  test("reduce() moves the selection within the parameter list", () => {
    let m = press(loaded(), "down", "down");
    expect(m.selected).toBe(2);
    m = press(m, "up", "up", "up");
    expect(m.selected).toBe(0);
    m = press(m, "last");
    expect(m.selected).toBe(m.parameters.length - 1);
    m = press(m, "pageDown");
    expect(m.selected).toBe(m.parameters.length - 1);
    m = press(m, "first", "pageDown");
    expect(m.selected).toBe(10);
  });

  test("reduce() moves between planets in the planets view", () => {
    let m = reduce(loaded(), key({ kind: "view", view: "planets" }));
    m = press(m, "down", "down");
    expect(m.planet).toBe(1);
    expect(m.selected).toBe(0);
  });

  test("reduce() cycles and swaps the pair's axes", () => {
    const n = loaded().parameters.length;
    let m = press(loaded(), "nextX", "nextX");
    expect(m.pairX).toBe(2);
    m = press(m, "prevY", "prevY");
    expect(m.pairY).toBe(n - 1);
    m = press(m, "swapPair");
    expect([m.pairX, m.pairY]).toEqual([n - 1, 2]);
    m = press(m, "down", "down", "down", "pairFromSelection");
    expect(m.pairX).toBe(3);
    expect(m.view).toBe("pair");
    expect(press(m, "toggleDots").pairStyle).toBe("dots");
  });

  test("reduce() toggles help and records quit", () => {
    let m = press(loaded(), "toggleHelp");
    expect(m.help).toBe(true);
    m = press(m, "closeHelp");
    expect(m.help).toBe(false);
    expect(press(m, "quit").quit).toBe(true);
  });

  test("reduce() follows resizes and keeps a minimum size", () => {
    let m = reduce(loaded(), { type: "resize", columns: 160, rows: 48 });
    expect([m.columns, m.rows]).toEqual([160, 48]);
    m = reduce(m, { type: "resize", columns: 3, rows: NaN });
    expect(m.columns).toBeGreaterThanOrEqual(20);
    expect(m.rows).toBeGreaterThanOrEqual(8);
  });

  test("reduce() keeps a load error until the next snapshot", () => {
    let m = reduce(loaded(), { type: "loadError", message: "chain file is locked" });
    expect(m.loadError).toBe("chain file is locked");
    m = reduce(m, { type: "snapshot", snapshot: convergedSnapshot() });
    expect(m.loadError).toBeUndefined();
    expect(m.updates).toBe(2);
  });

  test("reduce() does not mutate the model it is given", () => {
    const m = loaded();
    const before = { ...m };
    press(m, "down", "nextView", "toggleHelp", "nextX");
    expect(m).toEqual(before);
  });
});

describe("keyFromInput", () => {
  test("keyFromInput() maps digits, tab, arrows and letters", () => {
    expect(keyFromInput("3", {})).toEqual({ kind: "view", view: "pair" });
    expect(keyFromInput("9", {})).toBeUndefined();
    expect(keyFromInput("", { tab: true })).toEqual({ kind: "nextView" });
    expect(keyFromInput("", { tab: true, shift: true })).toEqual({ kind: "prevView" });
    expect(keyFromInput("", { downArrow: true })).toEqual({ kind: "down" });
    expect(keyFromInput("j", {})).toEqual({ kind: "down" });
    expect(keyFromInput("k", {})).toEqual({ kind: "up" });
    expect(keyFromInput("x", {})).toEqual({ kind: "nextX" });
    expect(keyFromInput("Y", {})).toEqual({ kind: "prevY" });
    expect(keyFromInput("?", {})).toEqual({ kind: "toggleHelp" });
    expect(keyFromInput("q", {})).toEqual({ kind: "quit" });
    expect(keyFromInput("", { escape: true })).toEqual({ kind: "closeHelp" });
    expect(keyFromInput("q", { ctrl: true })).toBeUndefined();
    expect(keyFromInput("z", {})).toBeUndefined();
  });
});

describe("keysFromInput", () => {
  test("keysFromInput() splits characters that arrive together", () => {
    expect(keysFromInput("3d", {})).toEqual([
      { kind: "view", view: "pair" },
      { kind: "toggleDots" },
    ]);
    expect(keysFromInput("jz?", {})).toEqual([{ kind: "down" }, { kind: "toggleHelp" }]);
    expect(keysFromInput("", { upArrow: true })).toEqual([{ kind: "up" }]);
    expect(keysFromInput("ab", { ctrl: true })).toEqual([]);
  });
});
