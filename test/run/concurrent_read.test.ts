import { expect, test } from "vitest";
import { readChain } from "../../src/run/chain_file.ts";
import { ChainFollower } from "../../src/run/follow.ts";
import { MAIN, sameBytes, writeSmallProblem } from "./_small_problem.ts";

const SHAPE = { walkers: 16, columns: 7 };

test(
  "readers reading while the writer appends never see a corrupt block or a changed value",
  async () => {
    const spec = await writeSmallProblem();
    const dir = spec.replace(/spec\.toml$/, "live");
    const writer = new Deno.Command(Deno.execPath(), {
      args: ["run", "-A", MAIN, "run", spec, "--out", dir, "--steps", "6000", "--threads", "1"],
      stdout: "null",
      stderr: "null",
    }).spawn();
    const follower = new ChainFollower(dir, { ...SHAPE, capacity: 64 });
    let reads = 0;
    let torn = 0;
    let last: Float64Array = new Float64Array(0);
    let done = false;
    writer.status.then(() => (done = true));
    // Read as fast as we can while the writer appends blocks of 50 steps.
    while (!done) {
      const r = await readChain(dir, SHAPE);
      reads++;
      expect(r.stop).not.toBe("corrupt");
      if (r.stop === "torn") torn++;
      // What was valid before stays valid and unchanged (append-only).
      expect(r.chain.data.length).toBeGreaterThanOrEqual(last.length);
      expect(sameBytes(r.chain.data.subarray(0, last.length), last)).toBe(true);
      for (const x of r.chain.data) expect(Number.isNaN(x)).toBe(false);
      last = r.chain.data;
      await follower.poll();
      expect(follower.corruptDetail).toBeUndefined();
    }
    expect((await writer.status).code).toBe(0);
    await follower.poll();
    const final = await readChain(dir, SHAPE);
    expect(final.stop).toBe("end");
    expect(final.chain.steps).toBe(6000);
    expect(follower.steps).toBe(6000);
    expect(reads).toBeGreaterThan(5);
    console.log(
      `concurrent reads: ${reads} whole-chain reads, ${torn} saw a block being written (torn, ignored)`,
    );
  },
  180_000,
);
