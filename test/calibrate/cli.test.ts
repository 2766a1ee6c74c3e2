import { describe, expect, test } from "vitest";
import { calibrateCommand } from "../../src/cli/calibrate.ts";
import { InputError } from "../../src/errors.ts";
import { fixtureSpec } from "./_fixtures.ts";

/** Run the command with console.log captured. */
async function runCaptured(args: string[]): Promise<{ code: number; out: string }> {
  const lines: string[] = [];
  const log = console.log;
  console.log = (...parts: unknown[]) => lines.push(parts.map(String).join(" "));
  try {
    const code = await calibrateCommand.run(args);
    return { code, out: lines.join("\n") };
  } finally {
    console.log = log;
  }
}

describe("calibrateCommand", () => {
  test(
    "calibrateCommand --json prints ranks and p-values per parameter and writes SVGs",
    async () => {
      const dir = await Deno.makeTempDir({ prefix: "rvwalk-calibrate-" });
      try {
        const { code, out } = await runCaptured([
          fixtureSpec("circular"),
          "--sims",
          "12",
          "--steps",
          "100",
          "--draws",
          "19",
          "--threads",
          "2",
          "--json",
          "--out",
          dir,
        ]);
        expect(code).toBe(0);
        const json = JSON.parse(out);
        const keys = Object.keys(json.parameters);
        expect(keys).toContain("b.period");
        expect(keys).toContain("echelleX.jitter");
        for (const key of keys) {
          const q = json.parameters[key];
          expect(q.p_value).toBeGreaterThanOrEqual(0);
          expect(q.p_value).toBeLessThanOrEqual(1);
          expect(q.ranks.length).toBe(12);
          for (const r of q.ranks) expect(r >= 0 && r <= 19).toBe(true);
          const svg = await Deno.readTextFile(`${dir}/rank_${key}.svg`);
          expect(svg).toContain(`${key}: χ² uniformity p =`);
        }
        const saved = JSON.parse(await Deno.readTextFile(`${dir}/calibration.json`));
        expect(saved.parameters).toEqual(json.parameters);
      } finally {
        await Deno.remove(dir, { recursive: true });
      }
    },
    120_000,
  );

  test("calibrateCommand prints the terminal histogram without --json", async () => {
    const dir = await Deno.makeTempDir({ prefix: "rvwalk-calibrate-" });
    try {
      const { code, out } = await runCaptured([
        fixtureSpec("circular"),
        "--sims=6",
        "--steps=60",
        "--draws=9",
        "--threads=1",
        `--out=${dir}`,
      ]);
      expect(code).toBe(0);
      expect(out).toContain("simulation-based calibration: 6 simulations");
      expect(out).toMatch(/b\.semi_amplitude +[\d.e-]+ /);
      expect(out).toContain("rank histograms (SVG)");
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  }, 120_000);

  test("calibrateCommand rejects bad options as input errors", async () => {
    const spec = fixtureSpec("circular");
    await expect(calibrateCommand.run([spec])).rejects.toThrow(InputError);
    await expect(calibrateCommand.run([spec, "--sims", "0"])).rejects.toThrow(InputError);
    await expect(calibrateCommand.run([spec, "--sims", "5", "--bins", "7"])).rejects.toThrow(
      InputError,
    );
    await expect(calibrateCommand.run([spec, "--sims", "5", "--start", "truth"])).rejects
      .toThrow(InputError);
    await expect(calibrateCommand.run([spec, "--sims", "5", "--walkers", "9"])).rejects.toThrow(
      InputError,
    );
  });
});
