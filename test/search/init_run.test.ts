/**
 * End to end on the invented three-planet data: `init` writes a spec, `check`
 * accepts it, a short `run` samples it and `summary --json` recovers the
 * planted orbits. The run is a child process (the real CLI); takes about a
 * minute on two busy cores.
 */
import { resolve } from "node:path";
import { describe, expect, test } from "vitest";
import { initCommand } from "../../src/cli/init.ts";
import { InputError } from "../../src/errors.ts";
import { normalQuantile } from "../../src/model/priors.ts";
import { parseSpecText } from "../../src/spec/mod.ts";
import { capture, readTruth, runCli, THREE_PLANETS } from "./_cli.ts";

/** Sampler steps of the run (60 walkers, as init writes for 20 free parameters). */
const STEPS = 3000;

interface Interval {
  median: number;
  lo68: number;
  hi68: number;
  lo95: number;
  hi95: number;
}

describe("initCommand", () => {
  test("initCommand writes a spec that check accepts and a short run recovers the planted orbits", async () => {
    const truth = await readTruth();
    const dir = await Deno.makeTempDir({ prefix: "rvwalk-init-" });
    try {
      const spec = `${dir}/spec/spec.toml`;
      const data = `${THREE_PLANETS}data.csv`;
      const init = await capture(() =>
        initCommand.run([
          data,
          "--planets",
          "3",
          "--trend",
          "--star-mass",
          "0.87,0.04",
          "--out",
          spec,
        ])
      );
      expect(init.value).toBe(0);
      expect(init.stdout.some((l) => l.startsWith("wrote "))).toBe(true);

      // The data path is written relative to the spec's folder and points at the data.
      const text = await Deno.readTextFile(spec);
      const files = /files = \["([^"]+)"\]/.exec(text)![1]!;
      expect(files.startsWith("/")).toBe(false);
      expect(resolve(`${dir}/spec`, files)).toBe(resolve(data));
      const written = parseSpecText(text, { file: spec, dir: `${dir}/spec` });
      expect(written.planets.length).toBe(3);
      expect(written.trend).toBeDefined();

      // An existing spec is not replaced without --force.
      await expect(capture(() => initCommand.run([data, "--out", spec]))).rejects.toThrow(
        InputError,
      );

      const check = await runCli(["check", spec]);
      expect(check.code, check.stderr).toBe(0);
      expect(check.stdout).toMatch(/\nok\n?$/);

      const run = await runCli([
        "run",
        spec,
        "--out",
        `${dir}/run`,
        "--steps",
        String(STEPS),
        "--no-ui",
        "--threads",
        "2",
      ]);
      expect(run.code, run.stderr).toBe(0);
      const summary = await runCli(["summary", `${dir}/run`, "--json"]);
      expect(summary.code, summary.stderr).toBe(0);
      const s = JSON.parse(summary.stdout) as {
        parameters: Record<string, Interval>;
        perParameter: Record<string, { ess_bulk: number }>;
      };

      // Truth against the posterior, for the period and K of each planet (6 quantities).
      // Six separate 95 % intervals would all contain the truth for only 0.95^6 = 74 % of data
      // sets even with an exact posterior, so the check uses simultaneous 95 % intervals
      // (Bonferroni correction, Dunn 1961, JASA 56, 52): per quantity the central
      // 1 - 0.05/6 interval, z = Phi^-1(1 - 0.05/12) = 2.64 posterior sigmas, with sigma from
      // the 68 % interval (posteriors near Gaussian). Monte Carlo error of the median is
      // sigma/sqrt(ESS); allow 4 of them.
      const z = normalQuantile(1 - 0.05 / 12);
      const names = written.planets.map((p) => p.name);
      for (const planted of truth.planets) {
        const name = names.find((n) =>
          Math.abs(s.parameters[`${n}.period`]!.median / planted.period - 1) < 0.01
        );
        expect(name, `planet at ${planted.period} d`).toBeDefined();
        for (
          const [q, value] of [["period", planted.period], [
            "semi_amplitude",
            planted.semi_amplitude,
          ]] as const
        ) {
          const key = `${name}.${q}`;
          const iv = s.parameters[key]!;
          const sigma = 0.5 * (iv.hi68 - iv.lo68);
          const ess = s.perParameter[key]!.ess_bulk;
          const bound = (z + 4 / Math.sqrt(ess)) * sigma;
          expect(Math.abs(value - iv.median), `${key}: ${JSON.stringify(iv)}`).toBeLessThan(bound);
        }
      }
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  });
});
