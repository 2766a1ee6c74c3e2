/** `rvwalk export DIR --csv FILE`. @module */
import { stringify } from "csv-stringify/sync";
import { InputError } from "../errors.ts";
import { readChain } from "../run/chain_file.ts";
import { readManifest } from "../run/manifest.ts";
import { chainNotice, type Command, intOption, parseOptions, say, warn } from "./_common.ts";

export const exportCommand: Command = {
  name: "export",
  summary: "write a run's chain as CSV",
  help: `Usage: rvwalk export DIR --csv FILE [--burn N] [--thin K]

Writes one row per (stored step, walker): step,walker,log_posterior, then one
column per parameter key in physical units (days, m/s, degrees). \`step\` is
the sampler step after which the row was recorded (1-based; a run with
[sampler] thin = K stores steps K, 2K, …). Steps before N are
dropped (default 0: nothing dropped); every K-th step is kept (default 1).
Use - as FILE for standard output.`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      csv: { type: "string" },
      burn: { type: "string" },
      thin: { type: "string" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    if (values.csv === undefined) {
      throw new InputError("missing: expected --csv FILE", { field: "--csv" });
    }
    const dir = positionals[0]!;
    const m = await readManifest(dir);
    const burn = intOption(values.burn, "burn", 0, 0)!;
    const thin = intOption(values.thin, "thin", 1, 1)!;
    // Stored row k holds sampler step (k + 1)·storeThin; --burn counts sampler steps.
    const storeThin = m.thin ?? 1;
    const from = Math.ceil(burn / storeThin);
    const read = await readChain(dir, { walkers: m.walkers, columns: m.columns.length }, {
      from,
      thin,
    });
    const notice = chainNotice(dir, read);
    if (notice !== undefined) warn(notice);
    const keys = m.parameters.map((p) => p.key);
    const out: (string | number)[][] = [["step", "walker", "log_posterior", ...keys]];
    const { data, walkers, columns } = read.chain;
    for (let s = 0; s < read.chain.steps; s++) {
      const step = (from + s * thin + 1) * storeThin;
      for (let w = 0; w < walkers; w++) {
        const o = (s * walkers + w) * columns;
        const row: (string | number)[] = [step, w, data[o]!];
        for (let k = 2; k < columns; k++) row.push(data[o + k]!);
        out.push(row);
      }
    }
    const text = stringify(out);
    if (values.csv === "-") {
      await Deno.stdout.write(new TextEncoder().encode(text));
    } else {
      try {
        await Deno.writeTextFile(values.csv, text);
      } catch (err) {
        throw new InputError(`cannot write: ${(err as Error).message}`, {
          file: values.csv,
          field: "--csv",
        });
      }
      say(`wrote ${out.length - 1} rows × ${keys.length + 3} columns to ${values.csv}`);
    }
    return 0;
  },
};
