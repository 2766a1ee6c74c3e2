import { describe, expect, test } from "vitest";
import { parseRvCsv } from "../../src/data/mod.ts";
import { InputError } from "../../src/errors.ts";
import { parseSpecText, resolveProblem } from "../../src/spec/mod.ts";

const file = "spec.toml";
const BASE = `
title = "test"
[star]
mass_msun = { normal = [0.92, 0.03] }
[data]
files = ["data.csv"]
[[instrument]]
name = "spectroA"
offset = { uniform = [-200, 200], start = 0 }
jitter = { loguniform = [0.01, 50], start = 2 }
[[planet]]
name = "b"
period = { loguniform = [700, 1100], start = 905 }
tc = { uniform = [2460300, 2460800], start = 2460560 }
semi_amplitude = { loguniform = [0.1, 500], start = 45 }
eccentricity = { uniform = [0, 0.95], start = 0.1 }
omega_deg = { uniform = [-180, 180], start = 0 }
[trend]
slope = { uniform = [-1, 1] }
reference_time = 2460600
[sampler]
walkers = 64
steps = 20000
seed = 7
`;
const parse = (text: string) => parseSpecText(text, { file, dir: "/data" });
const failure = (text: string): string => {
  try {
    parse(text);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
  throw new Error("expected an InputError");
};

describe("parseSpecText()", () => {
  test("parseSpecText() reads the documented spec contract", () => {
    const s = parse(BASE);
    expect(s.title).toBe("test");
    expect(s.dataFiles).toEqual(["/data/data.csv"]);
    expect(s.star.massMsun.prior).toEqual({ kind: "normal", mu: 0.92, sigma: 0.03 });
    expect(s.planets[0]!.period).toEqual({
      prior: { kind: "loguniform", lo: 700, hi: 1100 },
      start: 905,
    });
    expect(s.planets[0]!.epochKind).toBe("tc");
    expect(s.trend?.referenceTime).toBe(2460600);
    expect(s.sampler.walkers).toBe(64);
    expect(s.sampler.steps).toBe(20000);
    expect(s.sampler.seed).toBe(7);
  });

  test("parseSpecText() takes a bare number or fixed = x as fixed", () => {
    const s = parse(
      BASE.replace("eccentricity = { uniform = [0, 0.95], start = 0.1 }", "eccentricity = 0")
        .replace("omega_deg = { uniform = [-180, 180], start = 0 }", "omega_deg = { fixed = 90 }"),
    );
    expect(s.planets[0]!.eccentricity.prior).toEqual({ kind: "fixed", value: 0 });
    expect(s.planets[0]!.omegaDeg.prior).toEqual({ kind: "fixed", value: 90 });
  });

  test("parseSpecText() names the key for bad priors", () => {
    expect(failure(BASE.replace("[700, 1100]", "[1100, 700]"))).toBe(
      "spec.toml: b.period: found loguniform = [1100, 700]: expected lo < hi",
    );
    expect(failure(BASE.replace("loguniform = [700, 1100]", "gamma = [1, 2]"))).toMatch(
      /b\.period: found keys gamma: expected one prior kind of uniform, loguniform/,
    );
    expect(failure(BASE.replace("start = 905", "start = 5000"))).toMatch(
      /b\.period\.start: found 5000: expected inside the prior \[700, 1100\]/,
    );
    expect(failure(BASE.replace("uniform = [0, 0.95], start = 0.1", "uniform = [0, 1.5]"))).toMatch(
      /b\.eccentricity: prior support \[0, 1\.5\]: expected within \[0, 1\)/,
    );
    expect(failure(BASE.replace("walkers = 64", "walkers = -3"))).toMatch(
      /sampler\.walkers: found -3/,
    );
    expect(failure(BASE.replace("steps = 20000", "steps = 0"))).toMatch(/sampler\.steps: found 0/);
    expect(failure(BASE + "\n[extra]\n")).toMatch(/extra: unknown key/);
    expect(failure("title = ")).toMatch(/^spec\.toml(:\d+)?: cannot parse TOML/);
    expect(failure(BASE.replace("mass_msun = { normal = [0.92, 0.03] }", ""))).toMatch(
      /star\.mass_msun: missing/,
    );
  });
});

describe("resolveProblem()", () => {
  const csv =
    "time,rv,rv_err,instrument\n2460000,1,1,spectroA\n2460100,2,1,spectroB\n2460200,3,1,spectroB\n";
  test("resolveProblem() gives data-only instruments defaults and says so", () => {
    const p = resolveProblem(parse(BASE), parseRvCsv(csv, { file: "data.csv" }));
    expect(p.spec.instruments.map((i) => i.name)).toEqual(["spectroA", "spectroB"]);
    expect(p.spec.instruments[1]!.defaulted).toBe(true);
    expect(Array.from(p.data.instrument)).toEqual([0, 1, 1]);
    expect(p.notes.join("\n")).toMatch(/instrument spectroB: no \[\[instrument\]\] table/);
  });
  test("resolveProblem() refuses an instrument with no data", () => {
    const only = "time,rv,rv_err,instrument\n2460000,1,1,spectroB\n";
    expect(() => resolveProblem(parse(BASE), parseRvCsv(only, { file: "data.csv" }))).toThrow(
      /instrument `spectroA` has no rows in the data/,
    );
  });
  test("resolveProblem() warns about a period prior beyond ten data spans", () => {
    // Span 200 d: a prior up to 1100 d is within ten spans, no warning.
    expect(resolveProblem(parse(BASE), parseRvCsv(csv, { file: "data.csv" })).warnings).toEqual([]);
    const short = "time,rv,rv_err,instrument\n2460000,1,1,spectroA\n2460050,2,1,spectroA\n";
    const p = resolveProblem(parse(BASE), parseRvCsv(short, { file: "data.csv" }));
    expect(p.warnings.join()).toMatch(
      /b\.period: prior reaches 1100 d, more than ten times the data span of 50 d/,
    );
  });
});
