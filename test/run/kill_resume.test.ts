import { expect, test } from "vitest";
import seedrandom from "seedrandom";
import { readChain } from "../../src/run/chain_file.ts";
import { loadCheckpoint } from "../../src/run/checkpoint.ts";
import { cli, MAIN, sameBytes, writeSmallProblem } from "./_small_problem.ts";

const KILLS = 30;
const SHAPE = { walkers: 16, columns: 7 };

function spawn(args: string[]): Deno.ChildProcess {
  return new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", MAIN, ...args],
    stdout: "null",
    stderr: "null",
  }).spawn();
}

test(
  `run survives ${KILLS} SIGKILLs at random moments and ends byte-identical to a straight run`,
  async () => {
    const spec = await writeSmallProblem();
    const base = spec.replace(/spec\.toml$/, "");
    const dir = `${base}killed`;
    const rng = seedrandom("kill-moments");
    let previous = new Uint8Array(0);
    let kills = 0;
    let lastCheckpoint = 0;
    for (let round = 0; kills < KILLS; round++) {
      expect(round).toBeLessThan(3 * KILLS);
      let hasManifest = true;
      try {
        await Deno.stat(`${dir}/manifest.json`);
      } catch {
        hasManifest = false;
      }
      // Until a manifest exists the run is started again; after that it is resumed
      // (a resume before the first checkpoint starts from the beginning by design).
      const child = spawn(
        hasManifest
          ? ["resume", dir, "--threads", "1"]
          : ["run", spec, "--out", dir, "--steps", "1000000", "--threads", "1"],
      );
      // A random moment between 0.3 s (start-up) and 1.5 s.
      await new Promise((r) => setTimeout(r, 300 + 1200 * rng()));
      let alive = true;
      try {
        child.kill("SIGKILL");
      } catch {
        alive = false;
      }
      const status = await child.status;
      if (alive && status.signal === "SIGKILL") kills++;
      let cpStep = 0;
      try {
        cpStep = (await loadCheckpoint(dir)).checkpoint.step;
      } catch {
        continue; // killed before the first checkpoint: the next round starts over
      }
      const read = await readChain(dir, SHAPE);
      // Readers see only whole, checked blocks; the torn tail (if any) is invisible.
      expect(["end", "torn"]).toContain(read.stop);
      // At most one block (flush_steps = 50) beyond the checkpoint was written.
      expect(read.stepsOnDisk - cpStep).toBeGreaterThanOrEqual(0);
      expect(read.stepsOnDisk - cpStep).toBeLessThanOrEqual(50);
      // Flushed work is never lost or changed.
      expect(cpStep).toBeGreaterThanOrEqual(lastCheckpoint);
      const now = new Uint8Array(read.chain.data.buffer);
      const keep = Math.min(previous.length, cpStep * 16 * 7 * 8);
      expect(sameBytes(now.subarray(0, keep), previous.subarray(0, keep))).toBe(true);
      previous = now.slice(0, cpStep * 16 * 7 * 8);
      lastCheckpoint = cpStep;
    }
    const target = lastCheckpoint + 137;
    const fin = await cli(["resume", dir, "--steps", String(target), "--threads", "1"]);
    expect(fin.code).toBe(0);
    const straight = `${base}straight`;
    expect(
      (await cli(["run", spec, "--out", straight, "--steps", String(target), "--threads", "1"]))
        .code,
    ).toBe(0);
    const a = await readChain(dir, SHAPE);
    const b = await readChain(straight, SHAPE);
    expect(a.chain.steps).toBe(target);
    expect(sameBytes(a.chain.data, b.chain.data)).toBe(true);
  },
  300_000,
);
