import { render } from "ink-testing-library";
import { afterEach, describe, expect, test } from "vitest";
import { App } from "../../tui/App.tsx";
import { Dashboard } from "../../tui/components/Dashboard.tsx";
import { toneProps } from "../../tui/components/tone.ts";
import { initialModel, reduce, VIEWS } from "../../tui/model.ts";
import { buildScreen } from "../../tui/screen.ts";
import type { RunSnapshot } from "../../tui/snapshot.ts";
import { convergedSnapshot, unconvergedSnapshot } from "./_fixtures.ts";

const ESC = "\u001b";
const tick = (ms = 30) => new Promise((resolve) => setTimeout(resolve, ms));
const mounted: { unmount: () => void }[] = [];
afterEach(() => {
  for (const m of mounted.splice(0)) m.unmount();
});

/** Wait until the last frame satisfies `ok` (polling every 10 ms, at most 2 s). */
async function until(frame: () => string | undefined, ok: (f: string) => boolean): Promise<string> {
  for (let i = 0; i < 200; i++) {
    const f = frame() ?? "";
    if (ok(f)) return f;
    await tick(10);
  }
  return frame() ?? "";
}

function mount(
  snapshot: RunSnapshot,
  options: { columns?: number; rows?: number; onExit?: () => void } = {},
) {
  const r = render(
    <App
      load={() => Promise.resolve(snapshot)}
      color={false}
      intervalMs={500}
      columns={options.columns ?? 80}
      rows={options.rows ?? 24}
      {...(options.onExit ? { onExit: options.onExit } : {})}
    />,
  );
  mounted.push(r);
  return r;
}

function checkSize(frame: string, columns: number, rows: number) {
  const lines = frame.split("\n");
  expect(lines.length).toBeLessThanOrEqual(rows);
  for (const l of lines) expect(Array.from(l).length, l).toBeLessThanOrEqual(columns);
}

describe("Dashboard", () => {
  test("Dashboard() renders each view from a fixture view-model with its key numbers", () => {
    const snap = convergedSnapshot();
    let m = reduce(initialModel({ columns: 80, rows: 24, color: false }), {
      type: "snapshot",
      snapshot: snap,
    });
    const expected: Record<string, RegExp> = {
      convergence: /b\.period\s+1\.00\d\s+\d+\s+\d+/,
      posterior: /b\.semiAmplitude\s+56\.\d/,
      pair: /corr [+-]\d\.\d\d {2}n=2000/,
      trace: /walker-mean log posterior {2}last -12\d\d/,
      planets: /m sin i \(lower limit\)\s+0\.48\d/,
    };
    for (const view of VIEWS) {
      m = reduce(m, { type: "key", key: { kind: "view", view } });
      const r = render(<Dashboard screen={buildScreen(m)} />);
      mounted.push(r);
      const frame = r.lastFrame() ?? "";
      expect(frame, view).toMatch(expected[view]!);
      expect(frame).toMatch(/step 20000\/20000 {2}413 steps\/s {2}ETA done/);
      expect(frame).toMatch(/walkers 64 {2}threads 2/);
      checkSize(frame, 80, 24);
    }
  });

  test("Dashboard() shows warning marks for the unconverged fixture without colour codes", () => {
    const m = reduce(initialModel({ columns: 80, rows: 24, color: false }), {
      type: "snapshot",
      snapshot: unconvergedSnapshot(),
    });
    const r = render(<Dashboard screen={buildScreen(m)} />);
    mounted.push(r);
    const frame = r.lastFrame() ?? "";
    expect(frame).not.toContain(ESC);
    expect(frame).toMatch(/b\.period\s+1\.300!\s+45!\s+31!.*BAD/);
    expect(frame).toMatch(/spectroA\.jitter\s+1\.050~.*warn/);
    expect(frame).toMatch(/! 1 stuck walker: #7/);
    // ETA = (20000 - 1200) / 85 s = 221 s.
    expect(frame).toContain("ETA 3m 41s");
  });

  test("toneProps() gives no colour or style props at all when colour is off", () => {
    for (
      const tone of ["plain", "strong", "dim", "accent", "good", "warn", "bad", "cursor"] as const
    ) {
      expect(toneProps(tone, false)).toEqual({});
    }
    expect(toneProps("bad", true).color).toBe("red");
  });
});

describe("App", () => {
  test("App() polls the loader and draws the convergence view", async () => {
    let calls = 0;
    const snap = convergedSnapshot();
    const r = render(
      <App
        load={() => {
          calls++;
          return Promise.resolve(snap);
        }}
        color={false}
        columns={80}
        rows={24}
      />,
    );
    mounted.push(r);
    const frame = await until(r.lastFrame, (f) => f.includes("b.period"));
    expect(frame).toMatch(/\[1 convergence\]/);
    expect(calls).toBe(1);
  });

  test("App() switches views and parameters with keys", async () => {
    const r = mount(convergedSnapshot());
    await until(r.lastFrame, (f) => f.includes("b.period"));
    r.stdin.write("2");
    let f = await until(r.lastFrame, (x) => x.includes("[2 posterior]"));
    expect(f).toMatch(/> b\.period/);
    r.stdin.write("j");
    f = await until(r.lastFrame, (x) => x.includes("> b.tc"));
    expect(f).toMatch(/^b\.tc: median 2459000\.42\d*/m);
    r.stdin.write("\t");
    f = await until(r.lastFrame, (x) => x.includes("[3 pair]"));
    expect(f).toMatch(/y b\.tc \[d\] {2}vs {2}x b\.period \[d\]/);
    r.stdin.write("x");
    f = await until(r.lastFrame, (x) => x.includes("vs  x b.tc"));
    r.stdin.write("y");
    f = await until(r.lastFrame, (x) => x.includes("y b.semiAmplitude"));
    expect(f).toMatch(/y b\.semiAmplitude \[m\/s\] {2}vs {2}x b\.tc \[d\]/);
    r.stdin.write("?");
    f = await until(r.lastFrame, (x) => x.includes("Keys"));
    expect(f).toMatch(/q\s+leave the dashboard/);
    r.stdin.write("5");
    f = await until(r.lastFrame, (x) => x.includes("[5 planets]"));
    expect(f).toContain("planet b");
    r.stdin.write(`${ESC}[D`); // left arrow: previous view
    f = await until(r.lastFrame, (x) => x.includes("[4 trace]"));
    expect(f).toContain("walker-mean log posterior");
  });

  test("App() calls onExit when q is pressed", async () => {
    let exited = 0;
    const r = mount(convergedSnapshot(), { onExit: () => exited++ });
    await until(r.lastFrame, (f) => f.includes("b.period"));
    r.stdin.write("q");
    await tick();
    expect(exited).toBe(1);
  });

  test("App() keeps every line within 80 columns in every view", async () => {
    for (const snap of [convergedSnapshot(), unconvergedSnapshot()]) {
      const r = mount(snap);
      await until(r.lastFrame, (f) => f.includes("b.period"));
      for (const n of ["1", "2", "3", "4", "5"]) {
        r.stdin.write(n);
        const f = await until(r.lastFrame, (x) => x.includes(`[${n} `));
        checkSize(f, 80, 24);
      }
      r.stdin.write("d"); // braille dots in the pair view
      r.stdin.write("3");
      checkSize(await until(r.lastFrame, (x) => x.includes("dots: every pixel")), 80, 24);
      r.stdin.write("?");
      checkSize(await until(r.lastFrame, (x) => x.includes("Keys")), 80, 24);
    }
  });

  test("App() uses more of a 160x48 terminal", async () => {
    const r = mount(convergedSnapshot(), { columns: 160, rows: 48 });
    await until(r.lastFrame, (f) => f.includes("b.period"));
    r.stdin.write("2");
    const f = await until(r.lastFrame, (x) => x.includes("[2 posterior]"));
    checkSize(f, 160, 48);
    expect(Math.max(...f.split("\n").map((l) => Array.from(l).length))).toBeGreaterThan(120);
  });

  test("App() redraws for the terminal size after a resize event", async () => {
    const r = render(<App load={() => Promise.resolve(convergedSnapshot())} color={false} />);
    mounted.push(r);
    // ink-testing-library's stdout reports 100 columns and no rows.
    await until(r.lastFrame, (f) => f.includes("b.period"));
    Object.defineProperty(r.stdout, "columns", { value: 60, configurable: true });
    Object.defineProperty(r.stdout, "rows", { value: 20, configurable: true });
    r.stdout.emit("resize");
    const f = await until(
      r.lastFrame,
      (x) => x.split("\n").every((l) => Array.from(l).length <= 60),
    );
    checkSize(f, 60, 20);
  });

  test("App() shows a load error and keeps the last snapshot", async () => {
    let n = 0;
    const snap = convergedSnapshot();
    const r = render(
      <App
        load={() => (n++ === 0
          ? Promise.resolve(snap)
          : Promise.reject(new Error("cannot open chain")))}
        color={false}
        intervalMs={10}
        columns={80}
        rows={24}
      />,
    );
    mounted.push(r);
    await until(r.lastFrame, (f) => f.includes("b.period"));
    // The interval is raised to 500 ms, so the failing second read comes after that.
    const f = await until(r.lastFrame, (x) => x.includes("cannot refresh"));
    expect(f).toContain("! cannot refresh: cannot open chain");
    expect(f).toContain("b.period");
  });
});

describe("App input", () => {
  test("App() applies keys that arrive in one chunk in order", async () => {
    const r = mount(convergedSnapshot());
    await until(r.lastFrame, (f) => f.includes("b.period"));
    r.stdin.write("3d");
    const f = await until(r.lastFrame, (x) => x.includes("dots: every pixel"));
    expect(f).toContain("[3 pair]");
  });
});
