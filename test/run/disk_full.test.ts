import { expect, test } from "vitest";
import { readChain } from "../../src/run/chain_file.ts";
import { loadCheckpoint } from "../../src/run/checkpoint.ts";
import { cli, MAIN, sameBytes, writeSmallProblem } from "./_small_problem.ts";

const SHAPE = { walkers: 16, columns: 7 };

/** A small file system that fills up: tmpfs where we may mount (root), else null. */
async function smallFilesystem(): Promise<string | null> {
  const dir = await Deno.makeTempDir({ prefix: "rvwalk-tmpfs-" });
  const out = await new Deno.Command("mount", {
    args: ["-t", "tmpfs", "-o", "size=600k", "tmpfs", dir],
    stdout: "null",
    stderr: "null",
  }).output().catch(() => ({ success: false }));
  return out.success ? dir : null;
}

test("a full disk stops the run cleanly; the last checkpoint is intact and resumable", async () => {
  const spec = await writeSmallProblem();
  const base = spec.replace(/spec\.toml$/, "");
  const mnt = Deno.env.get("RVWALK_TEST_NO_TMPFS") ? null : await smallFilesystem();
  let failedDir: string;
  let child: Deno.CommandOutput;
  if (mnt !== null) {
    // A real ENOSPC: a 600 KiB tmpfs holds about 80 blocks of 50 steps × 16 walkers × 7 columns.
    failedDir = `${mnt}/run`;
    child = await new Deno.Command(Deno.execPath(), {
      args: [
        "run",
        "-A",
        MAIN,
        "run",
        spec,
        "--out",
        failedDir,
        "--steps",
        "100000",
        "--threads",
        "1",
      ],
      stdout: "piped",
      stderr: "piped",
    }).output();
  } else {
    // Fallback where mounting is not allowed: a file-size limit (EFBIG on the chain file;
    // SIGXFSZ ignored so the write fails instead of killing the process).
    failedDir = `${base}limited`;
    child = await new Deno.Command("/bin/sh", {
      args: [
        "-c",
        `trap '' XFSZ; ulimit -f 600; exec "$0" run -A "$1" run "$2" --out "$3" --steps 100000 --threads 1`,
        Deno.execPath(),
        MAIN,
        spec,
        failedDir,
      ],
      stdout: "piped",
      stderr: "piped",
    }).output();
  }
  try {
    const stderr = new TextDecoder().decode(child.stderr);
    console.log(`disk full (${mnt !== null ? "tmpfs" : "ulimit -f"}): ${stderr.trim()}`);
    // Exit 1 (a run failure), one clear message naming the checkpoint and how to resume.
    expect(child.code).toBe(1);
    expect(stderr).toMatch(
      /run failed at step \d+: .*(No space left|too large|os error).*checkpoint.*is intact.*rvwalk resume/s,
    );
    const cp = (await loadCheckpoint(failedDir)).checkpoint;
    expect(cp.step).toBeGreaterThan(0);
    const read = await readChain(failedDir, SHAPE);
    expect(read.stop).not.toBe("corrupt");
    expect(read.stepsOnDisk).toBeGreaterThanOrEqual(cp.step);
    // The user frees space (here: moves the run to a roomy disk) and resumes.
    const moved = `${base}moved`;
    await new Deno.Command("cp", { args: ["-r", failedDir, moved] }).output();
    const target = cp.step + 100;
    const r = await cli(["resume", moved, "--steps", String(target), "--threads", "1"]);
    expect(r.code).toBe(0);
    const straight = `${base}straight`;
    expect(
      (await cli(["run", spec, "--out", straight, "--steps", String(target), "--threads", "1"]))
        .code,
    )
      .toBe(0);
    const a = await readChain(moved, SHAPE);
    const b = await readChain(straight, SHAPE);
    expect(a.chain.steps).toBe(target);
    expect(sameBytes(a.chain.data, b.chain.data)).toBe(true);
  } finally {
    if (mnt !== null) {
      await new Deno.Command("umount", { args: [mnt] }).output();
    }
  }
}, 300_000);
