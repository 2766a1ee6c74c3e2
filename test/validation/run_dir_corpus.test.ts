/**
 * Bad run directories and output paths, through the real CLI: an output path
 * that is a file or cannot be written, a chain file cut mid-block or damaged,
 * a corrupted checkpoint, a manifest from a newer rvwalk, and `--debug`.
 */
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { type CliResult, lines, runCli, writeCase } from "./_cli.ts";

let root = "";
let base = "";
let baseChain = new Uint8Array(0);
// Chain of the base run: 3 blocks of 20 steps × 16 walkers × (2 + 5) columns.
const BLOCK_BYTES = 32 + 8 * 20 * 16 * 7;

async function copyDir(from: string, to: string): Promise<void> {
  await Deno.mkdir(to, { recursive: true });
  for await (const e of Deno.readDir(from)) {
    if (e.isFile) await Deno.copyFile(`${from}/${e.name}`, `${to}/${e.name}`);
  }
}

/** A copy of the base run named `name`, inside the case folder (cwd of the CLI). */
async function runCopy(name: string): Promise<string> {
  await copyDir(`${base}/run`, `${base}/${name}`);
  return `${base}/${name}`;
}

const cli = (args: string[]): Promise<CliResult> => runCli(args, base);

/** One line on stderr, no stack trace. */
function oneLine(r: CliResult): string {
  const l = lines(r.stderr);
  expect(l, r.stderr).toHaveLength(1);
  expect(r.stderr).not.toMatch(/^\s+at /m);
  return l[0]!.replaceAll(base, "$DIR");
}

beforeAll(async () => {
  root = await Deno.makeTempDir({ prefix: "rvwalk-rundir-" });
  base = await writeCase(root, "base", {});
  const r = await cli(["run", "spec.toml", "--out", "run", "--threads", "1"]);
  expect(r.code).toBe(0);
  baseChain = await Deno.readFile(`${base}/run/chain.bin`);
  expect(baseChain.length).toBe(3 * BLOCK_BYTES);
  await Deno.writeTextFile(`${base}/afile`, "not a folder\n");
});
afterAll(async () => {
  if (root !== "") await Deno.remove(root, { recursive: true });
});

describe.concurrent("rvwalk run on bad output paths", () => {
  test("rvwalk run refuses an output path that is a file (R01)", async () => {
    const r = await cli(["run", "spec.toml", "--out", "afile", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk run: afile: --out: output path is a file: expected a folder for the run directory (new or empty)",
    );
    expect(await Deno.readTextFile(`${base}/afile`)).toBe("not a folder\n");
  });

  test("rvwalk run refuses a path through a file, a folder it cannot create (R02)", async () => {
    const r = await cli(["run", "spec.toml", "--out", "afile/run", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk run: afile/run: --out: cannot use output path (Not a directory (os error 20): stat 'afile/run'): expected a folder path",
    );
  });

  // Tests run as root, which may write anywhere on an ordinary file system.
  // sysfs refuses new files and folders even to root, so /sys/kernel is a folder
  // nobody can write and /sys/<new> one nobody can create (Linux only).
  test("rvwalk run refuses an existing folder it cannot write (R03)", async () => {
    const r = await cli(["run", "spec.toml", "--out", "/sys/kernel", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toMatch(
      /^rvwalk run: \/sys\/kernel: --out: run directory is not writable \(Permission denied \(os error 13\): writefile '\/sys\/kernel\/\.write-probe-\d+'\): expected a writable folder$/,
    );
  });

  test("rvwalk run refuses a folder it cannot create (R04)", async () => {
    const r = await cli(["run", "spec.toml", "--out", "/sys/rvwalk-no-such-out", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk run: /sys/rvwalk-no-such-out: --out: cannot create the run directory (Operation not permitted (os error 1): mkdir '/sys/rvwalk-no-such-out'): expected a path where folders can be created",
    );
  });

  test("rvwalk run never overwrites an existing run (R05)", async () => {
    const r = await cli(["run", "spec.toml", "--out", "run", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk run: run: --out: already holds a run: use `resume` to continue it, or choose another --out",
    );
    expect(await Deno.readFile(`${base}/run/chain.bin`)).toEqual(baseChain);
  });
});

describe.concurrent("rvwalk summary and export on damaged chains", () => {
  test("rvwalk summary uses the complete blocks of a chain cut mid-block and says so (R06)", async () => {
    const dir = await runCopy("torn");
    await Deno.truncate(`${dir}/chain.bin`, 2 * BLOCK_BYTES + 1000);
    const r = await cli(["summary", "torn", "--json"]);
    expect(r.code).toBe(0);
    expect(oneLine(r)).toBe(
      `note: torn/chain.bin: ends in an incomplete block (block at byte ${
        2 * BLOCK_BYTES
      } is cut short: needs ${BLOCK_BYTES} bytes, 1000 on disk; a write cut short, or a run still writing): using the 40 complete steps before it`,
    );
    expect(JSON.parse(r.stdout).steps).toBe(40);
  });

  test("rvwalk summary stops at a damaged block and says so (R07)", async () => {
    const dir = await runCopy("flip");
    const bytes = await Deno.readFile(`${dir}/chain.bin`);
    bytes[BLOCK_BYTES + 500] = bytes[BLOCK_BYTES + 500]! ^ 0x01;
    await Deno.writeFile(`${dir}/chain.bin`, bytes);
    const r = await cli(["summary", "flip", "--json"]);
    expect(r.code).toBe(0);
    expect(oneLine(r)).toBe(
      `warning: flip/chain.bin: damaged after step 20 (payload checksum fails at byte ${BLOCK_BYTES}): using the 20 valid steps before it; the rest is ignored`,
    );
    expect(JSON.parse(r.stdout).steps).toBe(20);
  });

  test("rvwalk export writes the valid part of a cut chain and says so (R08)", async () => {
    const dir = await runCopy("torn2");
    await Deno.truncate(`${dir}/chain.bin`, BLOCK_BYTES + 40);
    const r = await cli(["export", "torn2", "--csv", "-"]);
    expect(r.code).toBe(0);
    expect(oneLine(r)).toMatch(
      /^note: torn2\/chain\.bin: ends in an incomplete block .*using the 20 complete steps before it$/,
    );
    // Header plus 20 steps × 16 walkers.
    expect(lines(r.stdout).length).toBe(1 + 20 * 16);
  });

  test("rvwalk export names an output file it cannot write (R09)", async () => {
    const r = await cli(["export", "run", "--csv", "afile/chain.csv"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toMatch(
      /^rvwalk export: afile\/chain\.csv: --csv: cannot write: Not a directory \(os error 20\)/,
    );
  });

  test("rvwalk summary refuses a burn-in longer than the chain (R10)", async () => {
    const r = await cli(["summary", "run", "--burn", "500"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk summary: --burn: found 500: expected fewer burn-in steps than the 60 on disk",
    );
  });
});

describe.concurrent("rvwalk resume on damaged checkpoints", () => {
  test("rvwalk resume falls back to checkpoint.prev.json, says so, and loses nothing (R11)", async () => {
    const dir = await runCopy("cpbad");
    const text = await Deno.readTextFile(`${dir}/checkpoint.json`);
    // Change one digit inside the body: valid JSON, failing checksum.
    const at = text.indexOf('\\"step\\":') + 9;
    const digit = text[at]!;
    await Deno.writeTextFile(
      `${dir}/checkpoint.json`,
      text.slice(0, at) + (digit === "9" ? "8" : String(Number(digit) + 1)) + text.slice(at + 1),
    );
    const r = await cli(["resume", "cpbad", "--threads", "1"]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    expect(r.stdout).toMatch(
      /^note: newest checkpoint unusable \(checkpoint\.json fails its checksum\); resumed from the previous one$/m,
    );
    // Resuming from step 40 re-samples steps 40..59 exactly as the first run did
    // (same seed, restored RNG state), so the chain on disk is byte-for-byte the same.
    expect(await Deno.readFile(`${dir}/chain.bin`)).toEqual(baseChain);
  });

  test("rvwalk resume falls back when checkpoint.json is cut short (R12)", async () => {
    const dir = await runCopy("cpcut");
    const text = await Deno.readTextFile(`${dir}/checkpoint.json`);
    await Deno.writeTextFile(`${dir}/checkpoint.json`, text.slice(0, 100));
    const r = await cli(["resume", "cpcut", "--threads", "1"]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(
      /^note: newest checkpoint unusable \(checkpoint\.json is not valid JSON \(truncated or overwritten\?\)\); resumed from the previous one$/m,
    );
    expect(await Deno.readFile(`${dir}/chain.bin`)).toEqual(baseChain);
  });

  test("rvwalk resume refuses when both checkpoints are unusable, keeping the chain (R13)", async () => {
    const dir = await runCopy("cpboth");
    await Deno.writeTextFile(`${dir}/checkpoint.json`, '{"crc32": 1, "body": "{}"}\n');
    await Deno.remove(`${dir}/checkpoint.prev.json`);
    const r = await cli(["resume", "cpboth", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      "rvwalk resume: cpboth/checkpoint.json: found no usable checkpoint (checkpoint.json fails its checksum; checkpoint.prev.json is missing): expected a valid checkpoint.json or checkpoint.prev.json; the chain can still be summarised",
    );
    expect(await Deno.readFile(`${dir}/chain.bin`)).toEqual(baseChain);
  });

  test("rvwalk resume does not trust a checkpoint that needs more chain than is on disk (R14)", async () => {
    const dir = await runCopy("short");
    await Deno.truncate(`${dir}/chain.bin`, BLOCK_BYTES);
    const r = await cli(["resume", "short", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(
      `rvwalk resume: short/checkpoint.json: found no usable checkpoint (checkpoint.json needs ${
        3 * BLOCK_BYTES
      } bytes of chain but chain.bin holds ${BLOCK_BYTES}; checkpoint.prev.json needs ${
        2 * BLOCK_BYTES
      } bytes of chain but chain.bin holds ${BLOCK_BYTES}): expected a valid checkpoint.json or checkpoint.prev.json; the chain can still be summarised`,
    );
  });
});

describe.concurrent("rvwalk on run directories from elsewhere", () => {
  async function newer(name: string): Promise<void> {
    const dir = await runCopy(name);
    const m = JSON.parse(await Deno.readTextFile(`${dir}/manifest.json`));
    m.formatVersion = 2;
    m.rvwalkVersion = "9.0.0";
    await Deno.writeTextFile(`${dir}/manifest.json`, JSON.stringify(m));
  }
  const NEWER =
    "manifest.json: formatVersion: found run-directory format 2, written by a newer rvwalk (9.0.0): expected format ≤ 1, which this rvwalk 0.1.0 reads; upgrade rvwalk to read this run";

  test("rvwalk summary and resume refuse a run directory of a newer format (R15)", async () => {
    await newer("newer");
    const s = await cli(["summary", "newer"]);
    expect(s.code).toBe(2);
    expect(oneLine(s)).toBe(`rvwalk summary: newer/${NEWER}`);
    const r = await cli(["resume", "newer", "--threads", "1"]);
    expect(r.code).toBe(2);
    expect(oneLine(r)).toBe(`rvwalk resume: newer/${NEWER}`);
    expect(await Deno.readFile(`${base}/newer/chain.bin`)).toEqual(baseChain);
  });

  test("rvwalk summary refuses a folder with no manifest and one with a broken manifest (R16)", async () => {
    const a = await cli(["summary", "."]);
    expect(a.code).toBe(2);
    expect(oneLine(a)).toBe(
      "rvwalk summary: ./manifest.json: found no manifest: expected a run directory written by rvwalk run",
    );
    const dir = await runCopy("badman");
    await Deno.writeTextFile(`${dir}/manifest.json`, '{"format": "rvwalk-run", ');
    const b = await cli(["summary", "badman"]);
    expect(b.code).toBe(2);
    expect(oneLine(b)).toMatch(
      /^rvwalk summary: badman\/manifest\.json: found text that is not valid JSON \(.+\): expected the manifest written by rvwalk run$/,
    );
  });

  test("rvwalk --debug adds the stack trace to the one line (R17)", async () => {
    await newer("newer-debug");
    const r = await cli(["summary", "newer-debug", "--debug"]);
    expect(r.code).toBe(2);
    const l = lines(r.stderr);
    expect(l[0]).toBe(`rvwalk summary: newer-debug/${NEWER}`);
    expect(l.length).toBeGreaterThan(2);
    expect(r.stderr).toMatch(/^\s+at readManifest \(file:.*manifest\.ts:\d+:\d+\)$/m);
  });
});
