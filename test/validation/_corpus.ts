/**
 * Runs a table of {@link InputCase}s through the real CLI (two child
 * processes at a time) and checks each: exit code, exactly the expected
 * stderr (one line for bad input), no stack trace, and the message naming
 * what was found and what was expected.
 * @module
 */
import { afterAll, beforeAll, expect, test } from "vitest";
import type { InputCase } from "./_cases.ts";
import { type CliResult, lines, pool, runCli, writeCase } from "./_cli.ts";

export function corpusTests(cases: readonly InputCase[]): void {
  let root = "";
  const results = new Map<string, { dir: string; result: CliResult }>();
  beforeAll(async () => {
    root = await Deno.makeTempDir({ prefix: "rvwalk-corpus-" });
    await pool(cases, 2, async (c) => {
      const dir = await writeCase(root, c.id, { spec: c.spec, data: c.data });
      results.set(c.id, { dir, result: await runCli(c.args ?? ["check", "spec.toml"], dir) });
    });
  });
  afterAll(async () => {
    if (root !== "") await Deno.remove(root, { recursive: true });
  });
  for (const c of cases) {
    test(`rvwalk ${(c.args ?? ["check"])[0]} gives ${c.code} and one clear line: ${c.id} ${c.what}`, () => {
      const { dir, result } = results.get(c.id)!;
      const stderr = result.stderr.replaceAll(dir, "$DIR");
      const stdout = result.stdout.replaceAll(dir, "$DIR");
      expect(result.code).toBe(c.code);
      expect(lines(stderr)).toEqual(c.stderr === "" ? [] : [c.stderr]);
      // No stack trace without --debug (common practice, no source: frames start with "at ").
      expect(stderr).not.toMatch(/^\s+at /m);
      expect(stderr).not.toMatch(/Error:/);
      if (c.code === 2 && c.wordingGap === undefined) {
        // Prefix names the command; the message says what was found and what was expected.
        // "Found" may be worded as found/missing/no such/unknown/support or `name=value`
        // (the STYLE form `Cannot X as Y: a=1`).
        expect(stderr).toMatch(/^rvwalk [a-z]+: /);
        expect(stderr).toMatch(/\b(found|missing|no such|cannot|unknown|support)\b|\w=\S/);
        expect(stderr).toMatch(/\bexpected\b/);
      }
      if (c.stdout !== undefined) expect(stdout).toMatch(c.stdout);
    });
  }
}
