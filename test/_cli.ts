/**
 * The real rvwalk CLI run as a child process, for tests (no terminal, so no
 * dashboard; NO_COLOR set).
 * @module
 */

/** Path of the CLI entry point. */
export const MAIN = new URL("../src/cli/main.ts", import.meta.url).pathname;

/** What one CLI run gave. */
export interface CliResult {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

/** Run `rvwalk ARGS` (in `cwd` when given) and collect its exit code and output. */
export async function runCli(args: readonly string[], cwd?: string): Promise<CliResult> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", MAIN, ...args],
    ...(cwd === undefined ? {} : { cwd }),
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const dec = new TextDecoder();
  // Deno itself (not rvwalk) prints this while another deno process sets up
  // node_modules; tests run several CLIs at once, so it is dropped here.
  const stderr = dec.decode(out.stderr).replace(
    /^Blocking waiting for file lock on node_modules directory\n/gm,
    "",
  );
  return { code: out.code, stdout: dec.decode(out.stdout), stderr };
}
