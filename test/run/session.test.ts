import { describe, expect, test } from "vitest";
import { readChain } from "../../src/run/chain_file.ts";
import { loadCheckpoint } from "../../src/run/checkpoint.ts";
import { readManifest } from "../../src/run/manifest.ts";
import { cli, sameBytes, writeSmallProblem } from "./_small_problem.ts";

async function chainBytes(dir: string): Promise<Uint8Array> {
  const m = await readManifest(dir);
  const r = await readChain(dir, { walkers: m.walkers, columns: m.columns.length });
  return new Uint8Array(r.chain.data.buffer);
}

describe("run and resume", () => {
  test("resume after a clean stop equals a straight run byte for byte", async () => {
    const spec = await writeSmallProblem();
    const base = spec.replace(/spec\.toml$/, "");
    const straight = `${base}straight`;
    const split = `${base}split`;
    expect((await cli(["run", spec, "--out", straight, "--steps", "300", "--threads", "1"])).code)
      .toBe(0);
    expect((await cli(["run", spec, "--out", split, "--steps", "120", "--threads", "2"])).code)
      .toBe(0);
    const r = await cli(["resume", split, "--steps", "300", "--threads", "1"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/finished at step 300/);
    const a = await chainBytes(straight);
    const b = await chainBytes(split);
    expect(a.length).toBe(300 * 16 * 7 * 8); // 7 columns: log_posterior, accepted, 5 parameters
    expect(sameBytes(a, b)).toBe(true);
  });

  test("a second run into a live run's directory is refused", async () => {
    const spec = await writeSmallProblem();
    const dir = spec.replace(/spec\.toml$/, "live");
    const child = new Deno.Command(Deno.execPath(), {
      args: [
        "run",
        "-A",
        new URL("../../src/cli/main.ts", import.meta.url).pathname,
        "run",
        spec,
        "--out",
        dir,
        "--steps",
        "200000",
        "--threads",
        "1",
      ],
      stdout: "null",
      stderr: "null",
    }).spawn();
    try {
      // Wait until the writer holds the lock and has written a block.
      for (let i = 0; i < 200; i++) {
        try {
          if ((await Deno.stat(`${dir}/chain.bin`)).size > 0) break;
        } catch { /* not yet */ }
        await new Promise((r) => setTimeout(r, 50));
      }
      const second = await cli(["resume", dir]);
      expect(second.code).toBe(2);
      expect(second.stderr).toMatch(/run is being written by process \d+ on .* since/);
      const again = await cli(["run", spec, "--out", dir]);
      expect(again.code).toBe(2);
      expect(again.stderr).toMatch(/already holds a run: use `resume`/);
    } finally {
      child.kill("SIGTERM");
      await child.status;
    }
    // SIGTERM stops cleanly: status says stopped, the checkpoint matches the chain.
    const status = JSON.parse(await Deno.readTextFile(`${dir}/status.json`));
    expect(status.state).toBe("stopped");
    const cp = (await loadCheckpoint(dir)).checkpoint;
    expect(cp.chainBytes).toBe((await Deno.stat(`${dir}/chain.bin`)).size);
  });
});

describe("run --until-converged", () => {
  test("stops at the same step for any thread count, once the criteria hold", async () => {
    const { SMALL_SPEC } = await import("./_small_problem.ts");
    const spec = await writeSmallProblem({
      spec: SMALL_SPEC.replace("steps = 400", "steps = 50000\ncheck_every = 200"),
    });
    const base = spec.replace(/spec\.toml$/, "");
    const outs = [];
    for (const threads of ["1", "2"]) {
      const r = await cli([
        "run",
        spec,
        "--out",
        `${base}uc${threads}`,
        "--threads",
        threads,
        "--until-converged",
      ]);
      expect(r.code).toBe(0);
      const m = /step (\d+): convergence criteria met/.exec(r.stdout);
      expect(m, r.stdout).not.toBeNull();
      outs.push(Number(m![1]));
    }
    expect(outs[0]).toBe(outs[1]);
    expect(outs[0]! % 200).toBe(0);
    expect(outs[0]!).toBeLessThan(50000);
    expect(sameBytes(await chainBytes(`${base}uc1`), await chainBytes(`${base}uc2`))).toBe(true);
    // The stopped run's own summary agrees that the criteria hold.
    const s = JSON.parse((await cli(["summary", `${base}uc1`, "--json"])).stdout);
    expect(s.steps).toBe(outs[0]);
  });
});

describe("lock from another host", () => {
  test("resume refuses a lock held from another host unless --take-lock", async () => {
    const spec = await writeSmallProblem();
    const dir = spec.replace(/spec\.toml$/, "run");
    expect((await cli(["run", spec, "--out", dir, "--steps", "100", "--threads", "1"])).code).toBe(
      0,
    );
    // A lock left by a process on a node that is gone (another host name).
    await Deno.writeTextFile(
      `${dir}/lock`,
      JSON.stringify({
        pid: 4242,
        host: "lost-node-07",
        startTicks: 1,
        startedAt: "2026-01-01T00:00:00Z",
      }),
    );
    const refused = await cli(["resume", dir, "--more", "10", "--threads", "1"]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(
      /run is being written by process 4242 on lost-node-07 .*resume with --take-lock/,
    );
    const taken = await cli(["resume", dir, "--more", "10", "--threads", "1", "--take-lock"]);
    expect(taken.code).toBe(0);
    expect(taken.stdout).toMatch(/finished at step 110/);
  });
});
