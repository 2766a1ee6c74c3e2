import { describe, expect, test } from "vitest";
import { periodogramCommand } from "../../src/cli/periodogram.ts";
import { InputError } from "../../src/errors.ts";
import { capture, readTruth, THREE_PLANETS } from "./_cli.ts";

const DATA = `${THREE_PLANETS}data.csv`;

describe("periodogramCommand", () => {
  test("periodogramCommand --json finds the three planted periods within 1 % in order of strength", async () => {
    // Invented data (examples/three_planets, seed "quellan-318"): planets at 6.842, 52.71 and
    // 812 d with K 5.6, 8.3 and 21.4 m/s, a linear trend and two instruments.
    const truth = await readTruth();
    const { value: code, stdout } = await capture(() =>
      periodogramCommand.run([DATA, "--trend", "--signals", "3", "--json"])
    );
    expect(code).toBe(0);
    expect(stdout.length).toBe(1);
    const out = JSON.parse(stdout[0]!) as { signals: Record<string, number>[] };
    expect(Object.keys(out)).toEqual(["signals"]);
    expect(out.signals.length).toBe(3);
    for (const s of out.signals) {
      expect(Object.keys(s)).toEqual(["period", "power", "fap", "semi_amplitude"]);
      expect(s.fap).toBeLessThan(1e-3);
      expect(s.power).toBeGreaterThan(0);
      expect(s.power).toBeLessThanOrEqual(1);
    }
    for (const planet of truth.planets) {
      const match = out.signals.filter((s) => Math.abs(s.period! / planet.period - 1) < 0.01);
      expect(match.length, `period ${planet.period} d`).toBe(1);
    }
    // A sinusoid has most power where K is largest: the 812-d planet (K 21.4 m/s) comes first.
    expect(Math.abs(out.signals[0]!.period! / 812 - 1)).toBeLessThan(0.01);
  });

  test("periodogramCommand prints plots, the 1-day window peak and a signal table", async () => {
    const { value: code, stdout } = await capture(() =>
      periodogramCommand.run([DATA, "--trend", "--signals", "3"])
    );
    expect(code).toBe(0);
    const text = stdout.join("\n");
    // Nightly sampling puts the spectral window's strongest peak at 1 cycle per day
    // (Dawson & Fabrycky 2010, ApJ 722, 937, Sect. 2; recalled from memory); the example's
    // times are all within 3 h of local midnight.
    const windowLine = stdout[stdout.findIndex((l) => l.startsWith("window function")) + 1]!;
    const windowPeriod = Number(/period\s+([\d.]+) d/.exec(windowLine)![1]);
    expect(Math.abs(windowPeriod - 1)).toBeLessThan(0.01);
    // Three signals, then the highest remaining peak (not taken).
    expect(stdout.filter((l) => /^step \d: highest peak/.test(l)).length).toBe(4);
    expect(text).toContain("stopped after 3 signal(s)");
    const rows = stdout.filter((l) => /^\s+[123]\s+[\d.]+\s+0\.\d{4}\s+\S+\s+[\d.]+/.test(l));
    expect(rows.length).toBe(3);
  });

  test("periodogramCommand throws InputError for a missing file or inverted period range", async () => {
    await expect(capture(() => periodogramCommand.run([`${THREE_PLANETS}nope.csv`]))).rejects
      .toThrow(InputError);
    await expect(
      capture(() =>
        periodogramCommand.run([DATA, "--min-period", "10", "--max-period", "5", "--json"])
      ),
    ).rejects.toThrow(InputError);
    await expect(capture(() => periodogramCommand.run([DATA, "--fap-threshold", "0"]))).rejects
      .toThrow(InputError);
  });
});
