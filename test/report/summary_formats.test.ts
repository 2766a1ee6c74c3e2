import { describe, expect, test } from "vitest";
import { parse } from "csv-parse/sync";
import {
  formatSummary,
  latexEscape,
  latexValue,
  selectKeys,
} from "../../src/report/summary_formats.ts";
import type { Interval } from "../../src/report/quantiles.ts";
import type { Summary } from "../../src/report/summary.ts";
import { InputError } from "../../src/errors.ts";

/** An interval from median, errors and 95% bounds. */
function iv(median: number, minus: number, plus: number, unit: string): Interval {
  return {
    median,
    lo68: median - minus,
    hi68: median + plus,
    lo95: median - 2 * minus,
    hi95: median + 2 * plus,
    unit,
  };
}

function summary(): Summary {
  return {
    title: "invented",
    steps: 1000,
    walkers: 10,
    burn: 200,
    burnRule: "auto",
    thin: 1,
    draws: 8000,
    thresholds: { rhat: 1.01, essBulk: 400, stepsPerTau: 50 },
    parameters: {
      "b.period": iv(12.3456789, 0.00123, 0.00151, "d"),
      "b.semi_amplitude": iv(905.3456, 1.234, 1.456, "m/s"),
      "spectro_A.offset": iv(-3.14159, 0.5, 0.5, "m/s"),
      "b.eccentricity": iv(0.123456, 0.0123, 0.0456, ""),
    },
    derived: {
      "b.msini_mjup": iv(1.0, 0.0996, 0.2, "Mjup"),
      "b.a_au": iv(0.101234, 0.00112, 0.00108, "au"),
    },
    diagnostics: {
      rhat_max: 1,
      ess_bulk_min: 1000,
      ess_tail_min: 1000,
      tau_max: 10,
      steps_per_tau_min: 100,
      acceptance_mean: 0.3,
      stuck_walkers: [],
      converged: true,
      reasons: [],
    },
    perParameter: {},
  };
}

// Rounding convention (rounding.ts, common practice, no source): two significant
// digits on the smaller error; value and larger error to the same decimal place.
// Each expected string below is worked by hand from that rule.
describe("formatSummary() LaTeX", () => {
  const cases: [string, string, string][] = [
    // smaller error 1.234 → 1.2 (1 decimal): 905.3, +1.5 −1.2
    ["b.semi\\_amplitude", "$905.3^{+1.5}_{-1.2}$", "m\\,s$^{-1}$"],
    // smaller error 0.00123 → 0.0012 (4 decimals): 12.3457 +0.0015 −0.0012
    ["b.period", "$12.3457^{+0.0015}_{-0.0012}$", "d"],
    // equal errors 0.5 → 0.50: symmetric form
    ["spectro\\_A.offset", "$-3.14 \\pm 0.50$", "m\\,s$^{-1}$"],
    // smaller error 0.0123 → 0.012 (3 decimals)
    ["b.eccentricity", "$0.123^{+0.046}_{-0.012}$", ""],
    // 0.0996 rounds up to 0.10, so 2 decimals: 1.00 +0.20 −0.10
    ["b.msini\\_mjup", "$1.00^{+0.20}_{-0.10}$", "$M_\\mathrm{Jup}$"],
    // smaller error 0.00108 → 0.0011 (4 decimals): 0.1012 ± 0.0011 (both round to 0.0011)
    ["b.a\\_au", "$0.1012 \\pm 0.0011$", "au"],
  ];
  const tex = formatSummary(summary(), "latex");
  for (const [key, value, unit] of cases) {
    test(`formatSummary() writes ${key} as ${value}`, () => {
      expect(tex).toContain(`${key} & ${value} & ${unit} \\\\`);
    });
  }
  test("formatSummary() wraps the rows in a tabular inside a table without caption", () => {
    expect(tex.startsWith("\\begin{table}\n\\centering\n\\begin{tabular}{lcl}")).toBe(true);
    expect(tex.trimEnd().endsWith("\\end{tabular}\n\\end{table}")).toBe(true);
    expect(tex).not.toContain("\\caption");
    expect(tex).toContain("\\multicolumn{3}{l}{\\textit{Derived}}");
    // No unescaped underscore outside math.
    for (const line of tex.split("\n")) {
      expect(line.replace(/\$[^$]*\$/g, "")).not.toMatch(/(^|[^\\])_/);
    }
  });
  test("latexEscape() escapes every LaTeX special character", () => {
    expect(latexEscape("a_b&c%d$e#f{g}h~i^j\\k")).toBe(
      "a\\_b\\&c\\%d\\$e\\#f\\{g\\}h\\textasciitilde{}i\\textasciicircum{}j\\textbackslash{}k",
    );
  });
  test("latexValue() writes n/a values as a dash", () => {
    expect(latexValue(iv(NaN, 1, 1, ""))).toBe("--");
  });
});

describe("formatSummary() Markdown", () => {
  const md = formatSummary(summary(), "md");
  test("formatSummary() writes rounded values, 95% intervals and units in Markdown", () => {
    // 95% bounds 905.3456 − 2.468 = 902.8776 → 902.9 and + 2.912 = 908.2576 → 908.3 (1 decimal).
    expect(md).toContain("| `b.semi_amplitude` | 905.3 +1.5 / −1.2 | [902.9, 908.3] | m/s |");
    expect(md).toContain("| `spectro_A.offset` | -3.14 ± 0.50 | [-4.14, -2.14] | m/s |");
    expect(md).toContain("**Sampled parameters**");
    expect(md).toContain("**Derived quantities**");
    // (1000 − 200) steps × 10 walkers
    expect(md).toContain("8000 draws after a burn-in of 200 steps");
  });
});

describe("formatSummary() CSV", () => {
  const text = formatSummary(summary(), "csv");
  const rows = parse(text, { columns: true }) as Record<string, string>[];
  test("formatSummary() writes the agreed CSV columns", () => {
    expect(text.split("\n")[0]).toBe(
      "key,median,minus,plus,lo95,hi95,unit,kind,median_exact,minus_exact,plus_exact,lo95_exact,hi95_exact",
    );
    expect(rows.length).toBe(6);
  });
  const cases: [string, string, string, string, string][] = [
    ["b.semi_amplitude", "905.3", "1.2", "1.5", "m/s"],
    ["b.period", "12.3457", "0.0012", "0.0015", "d"],
    ["b.msini_mjup", "1.00", "0.10", "0.20", "Mjup"],
  ];
  for (const [key, median, minus, plus, unit] of cases) {
    test(`formatSummary() rounds ${key} in CSV and keeps the exact numbers`, () => {
      const r = rows.find((x) => x.key === key)!;
      expect([r.median, r.minus, r.plus, r.unit]).toEqual([median, minus, plus, unit]);
      const s = summary();
      const exact = s.parameters[key] ?? s.derived[key]!;
      expect(Number(r.median_exact)).toBe(exact.median);
      expect(Number(r.lo95_exact)).toBe(exact.lo95);
    });
  }
});

describe("selectKeys()", () => {
  const keys = ["b.period", "b.tc", "c.period", "spectroA.jitter", "spectroB.jitter"];
  test("selectKeys() takes exact keys and * globs in the order given", () => {
    expect(selectKeys(keys, ["*.jitter", "b.*"])).toEqual([
      "spectroA.jitter",
      "spectroB.jitter",
      "b.period",
      "b.tc",
    ]);
    // A dot in a pattern is literal: "b.period" does not match "bXperiod".
    expect(selectKeys(["bXperiod", "b.period"], ["b.period"])).toEqual(["b.period"]);
    expect(selectKeys(keys, ["c.period", "c.period"])).toEqual(["c.period"]);
  });
  test("selectKeys() rejects a pattern that matches nothing, naming it", () => {
    expect(() => selectKeys(keys, ["d.*"])).toThrow(InputError);
    expect(() => selectKeys(keys, ["d.*"])).toThrow(/d\.\*/);
  });
  test("formatSummary() shows only the chosen rows", () => {
    const tex = formatSummary(summary(), "latex", { params: ["b.msini_mjup", "b.period"] });
    expect(tex).toContain("b.period &");
    expect(tex).toContain("b.msini\\_mjup &");
    expect(tex).not.toContain("b.semi\\_amplitude");
  });
});
