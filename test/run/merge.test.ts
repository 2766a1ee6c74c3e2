import { describe, expect, test } from "vitest";
import { readChain } from "../../src/run/chain_file.ts";
import { readManifest } from "../../src/run/manifest.ts";
import { cli, SMALL_SPEC, writeSmallProblem } from "./_small_problem.ts";

describe("merge", () => {
  test("merge pools runs of the same model and data; summary and export work on the result", async () => {
    const spec = await writeSmallProblem();
    const base = spec.replace(/spec\.toml$/, "");
    for (const [name, seed, steps] of [["a", "1", "300"], ["b", "2", "250"]] as const) {
      const r = await cli([
        "run",
        spec,
        "--out",
        `${base}${name}`,
        "--seed",
        seed,
        "--steps",
        steps,
        "--threads",
        "1",
      ]);
      expect(r.code).toBe(0);
    }
    const m = await cli(["merge", `${base}a`, `${base}b`, "--out", `${base}pooled`]);
    expect(m.code).toBe(0);
    expect(m.stdout).toMatch(/using the first 250 of 300 steps/);
    expect(m.stdout).toMatch(/merged 2 runs: 32 walkers × 250 steps/);
    const manifest = await readManifest(`${base}pooled`);
    expect(manifest.walkers).toBe(32);
    expect(manifest.sources?.map((s) => s.seed)).toEqual([1, 2]);
    // Walkers 0–15 are run a's first 250 steps, 16–31 run b's, value for value.
    const pooled = (await readChain(`${base}pooled`, { walkers: 32, columns: 7 })).chain;
    const a = (await readChain(`${base}a`, { walkers: 16, columns: 7 })).chain;
    const b = (await readChain(`${base}b`, { walkers: 16, columns: 7 })).chain;
    for (const s of [0, 137, 249]) {
      for (const w of [0, 15]) {
        for (let c = 0; c < 7; c++) {
          expect(pooled.data[(s * 32 + w) * 7 + c]).toBe(a.data[(s * 16 + w) * 7 + c]);
          expect(pooled.data[(s * 32 + 16 + w) * 7 + c]).toBe(b.data[(s * 16 + w) * 7 + c]);
        }
      }
    }
    const summary = JSON.parse((await cli(["summary", `${base}pooled`, "--json"])).stdout);
    expect(summary.walkers).toBe(32);
    expect(summary.steps).toBe(250);
    expect(Object.keys(summary.parameters)).toContain("b.period");
    const out = `${base}pooled.csv`;
    expect((await cli(["export", `${base}pooled`, "--csv", out])).code).toBe(0);
    const rows = (await Deno.readTextFile(out)).trim().split("\n");
    expect(rows[0]).toBe(
      "step,walker,log_posterior,b.period,b.tc,b.semi_amplitude,inst.offset,inst.jitter",
    );
    expect(rows.length).toBe(1 + 250 * 32);
  });

  test("merge refuses runs of different data or model and names the difference", async () => {
    const spec = await writeSmallProblem();
    const base = spec.replace(/spec\.toml$/, "");
    expect((await cli(["run", spec, "--out", `${base}a`, "--steps", "60", "--threads", "1"])).code)
      .toBe(0);
    // Same model, one RV changed.
    const other = await writeSmallProblem();
    const dir2 = other.replace(/spec\.toml$/, "");
    const csv = (await Deno.readTextFile(`${dir2}data.csv`)).split("\n");
    csv[3] = csv[3]!.replace(/,([-0-9.]+),2\.0,/, (_m, v) => `,${(Number(v) + 1).toFixed(3)},2.0,`);
    await Deno.writeTextFile(`${dir2}data.csv`, csv.join("\n"));
    expect((await cli(["run", other, "--out", `${base}d`, "--steps", "60", "--threads", "1"])).code)
      .toBe(0);
    const d = await cli(["merge", `${base}a`, `${base}d`, "--out", `${base}x`]);
    expect(d.code).toBe(2);
    expect(d.stderr.trim()).toMatch(
      /^rvwalk merge: .*cannot merge .*d with .*a: data differ \(same number of RVs, different values\)$/,
    );
    // Same data, a different period prior.
    const wider = await writeSmallProblem({
      spec: SMALL_SPEC.replace("loguniform = [8, 12]", "loguniform = [7, 12]"),
    });
    expect((await cli(["run", wider, "--out", `${base}p`, "--steps", "60", "--threads", "1"])).code)
      .toBe(0);
    const p = await cli(["merge", `${base}a`, `${base}p`, "--out", `${base}y`]);
    expect(p.code).toBe(2);
    expect(p.stderr).toMatch(/planet b: period differs/);
  });
});
