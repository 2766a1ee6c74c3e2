import { describe, expect, test } from "vitest";
import { formatSummary, textWidth } from "../../tui/format.ts";
import { initialModel, reduce, type ViewModel, VIEWS } from "../../tui/model.ts";
import {
  type Body,
  buildScreen,
  densityBins,
  fitLine,
  type Line,
  lineText,
  type Screen,
  windowStart,
} from "../../tui/screen.ts";
import type { RunSnapshot } from "../../tui/snapshot.ts";
import { convergedSnapshot, PARAMETER_INDEX, unconvergedSnapshot } from "./_fixtures.ts";

function bodyLines(body: Body): readonly Line[] {
  switch (body.kind) {
    case "waiting":
    case "help":
      return body.lines;
    case "convergence":
      return [body.heading, ...body.rows, ...body.legend];
    case "posterior":
      return [body.heading, ...body.rows, ...body.detail];
    case "pair":
    case "trace":
      return [body.heading, ...body.plot, ...body.legend];
    case "planets":
      return [body.heading, ...body.rows, ...body.note];
  }
}

function allLines(s: Screen): string[] {
  return [...s.header, s.tabs, ...bodyLines(s.body), s.footer].map(lineText);
}

function modelFor(snapshot: RunSnapshot, columns: number, rows: number): ViewModel {
  return reduce(initialModel({ columns, rows, color: false }), { type: "snapshot", snapshot });
}

describe("buildScreen", () => {
  test("buildScreen() keeps every line within the width and the screen within the height", () => {
    const sizes: [number, number][] = [[80, 24], [160, 48], [40, 12], [100, 30], [20, 8]];
    for (const snapshot of [convergedSnapshot(), unconvergedSnapshot()]) {
      for (const [columns, rows] of sizes) {
        let m = modelFor(snapshot, columns, rows);
        for (const view of VIEWS) {
          for (const style of ["shade", "dots"] as const) {
            m = reduce(m, { type: "key", key: { kind: "view", view } });
            if (m.pairStyle !== style) m = reduce(m, { type: "key", key: { kind: "toggleDots" } });
            const lines = allLines(buildScreen(m));
            expect(lines.length, `${view} at ${columns}x${rows}`).toBeLessThanOrEqual(rows);
            for (const l of lines) {
              expect(textWidth(l), `${view}: ${l}`).toBeLessThanOrEqual(columns);
            }
          }
        }
        const help = allLines(buildScreen(reduce(m, { type: "key", key: { kind: "toggleHelp" } })));
        expect(help.length).toBeLessThanOrEqual(rows);
        for (const l of help) expect(textWidth(l)).toBeLessThanOrEqual(columns);
      }
    }
  });

  test("buildScreen() uses wider histograms on wider terminals", () => {
    const width = (columns: number) => {
      let m = modelFor(convergedSnapshot(), columns, 30);
      m = reduce(m, { type: "key", key: { kind: "view", view: "posterior" } });
      const body = buildScreen(m).body;
      if (body.kind !== "posterior") {
        throw new TypeError("Cannot test as the view is not posterior");
      }
      return textWidth(lineText([body.rows[0]![5]!]));
    };
    expect(width(160)).toBeGreaterThan(width(80) + 40);
  });

  test("buildScreen() flags the unconverged fixture with marks that read without colour", () => {
    const s = buildScreen(modelFor(unconvergedSnapshot(), 80, 24));
    const lines = allLines(s);
    const period = lines.find((l) => l.includes("b.period"))!;
    expect(period).toMatch(/1\.300!/);
    expect(period).toMatch(/45!/);
    expect(period).toMatch(/BAD/);
    const jitter = lines.find((l) => l.includes("spectroA.jitter"))!;
    expect(jitter).toMatch(/1\.050~/);
    expect(jitter).toMatch(/warn/);
    const unknown = lines.find((l) => l.includes("c.period"))!;
    expect(unknown).toMatch(/wait/);
    expect(lines.some((l) => l.includes("stuck walker") && l.includes("#7"))).toBe(true);
    expect(lines.join("\n")).toMatch(/converged no/);
  });

  test("buildScreen() marks every parameter of the converged fixture ok", () => {
    const body = buildScreen(modelFor(convergedSnapshot(), 80, 24)).body;
    if (body.kind !== "convergence") {
      throw new TypeError("Cannot test as the view is not convergence");
    }
    expect(body.rows.length).toBe(15);
    for (const row of body.rows) expect(lineText(row)).toMatch(/ ok\s*$/);
  });

  test("buildScreen() prints the posterior median to within its shown precision", () => {
    const snap = convergedSnapshot();
    let m = modelFor(snap, 80, 24);
    m = reduce(m, { type: "key", key: { kind: "view", view: "posterior" } });
    const lines = allLines(buildScreen(m));
    for (const key of ["b.semiAmplitude", "c.period", "spectroA.offset"]) {
      const draws = Array.from(snap.draws[PARAMETER_INDEX[key]!]!).sort((a, b) => a - b);
      // Independent median of an even number of draws.
      const median = (draws[draws.length / 2 - 1]! + draws[draws.length / 2]!) / 2;
      const line = lines.find((l) => l.includes(key))!;
      const shown = line.slice(line.indexOf(key) + key.length).trim().split(/\s+/)[0]!;
      const decimals = shown.includes(".") ? shown.split(".")[1]!.length : 0;
      expect(Math.abs(Number(shown) - median)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12);
    }
  });

  test("buildScreen() shows minimum masses, a, e and lambda per planet", () => {
    let m = modelFor(convergedSnapshot(), 80, 24);
    m = reduce(m, { type: "key", key: { kind: "view", view: "planets" } });
    const text = allLines(buildScreen(m)).join("\n");
    expect(text).toContain("planet b");
    expect(text).toContain("planet c");
    expect(text.match(/m sin i \(lower limit\)/g)?.length).toBe(4);
    expect(text).toContain("M_Jup");
    expect(text).toContain("M_Earth");
    expect(text.match(/lambda/g)?.length).toBe(1);
    expect(text.match(/psi/g)?.length).toBe(1);
    const b = m.planets[0]!.msiniMjup.summary;
    expect(text).toContain(formatSummary(b.median, b.lower, b.upper).median);
  });

  test("buildScreen() shows the planted correlation in the pair view", () => {
    let m = modelFor(convergedSnapshot(), 80, 24);
    m = {
      ...m,
      view: "pair",
      pairX: PARAMETER_INDEX["c.sqrtEcosOmega"]!,
      pairY: PARAMETER_INDEX["c.sqrtEsinOmega"]!,
    };
    const heading = lineText(bodyLines(buildScreen(m).body)[0]!);
    const r = Number(/corr ([+-]\d\.\d\d)/.exec(heading)![1]);
    // Planted rho = 0.6 with n = 2000: sd of r is about (1 - rho^2)/sqrt(n) = 0.014
    // (Fisher 1915 large-sample variance; recalled from memory); tolerance 4 sd.
    expect(Math.abs(r - 0.6)).toBeLessThan(4 * 0.014 + 0.005);
  });

  test("buildScreen() shows the waiting message before any snapshot", () => {
    const lines = allLines(buildScreen(initialModel({ columns: 80, rows: 24 })));
    expect(lines.join("\n")).toMatch(/Waiting for the first snapshot/);
  });
});

describe("layout helpers", () => {
  test("windowStart() keeps the selection visible", () => {
    expect(windowStart(10, 3, 20)).toBe(0);
    expect(windowStart(40, 0, 10)).toBe(0);
    expect(windowStart(40, 20, 10)).toBe(15);
    expect(windowStart(40, 39, 10)).toBe(30);
  });

  test("fitLine() cuts across segments and ends in an ellipsis", () => {
    const line = fitLine([{ text: "abc", tone: "plain" }, { text: "defg", tone: "bad" }], 5);
    expect(lineText(line)).toBe("abcd…");
    expect(line[1]!.tone).toBe("bad");
  });

  test("densityBins() follows the Rice rule within the cells available", () => {
    // 2 * 1000^(1/3) = 20.
    expect(densityBins(1000, 80)).toBe(20);
    expect(densityBins(1000, 12)).toBe(12);
    expect(densityBins(1, 80)).toBe(4);
  });
});
