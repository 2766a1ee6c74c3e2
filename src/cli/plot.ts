/** `rvwalk plot DIR`: the figures of a run as SVG (and PNG when possible). @module */
import { InputError } from "../errors.ts";
import { readChain } from "../run/chain_file.ts";
import { readManifest } from "../run/manifest.ts";
import { summarise } from "../report/summary.ts";
import { runFigures } from "../report/svg/mod.ts";
import { type Command, intOption, parseOptions, say, warn } from "./_common.ts";

export const plotCommand: Command = {
  name: "plot",
  summary: "figures of a run as SVG: RV fit, phase folds, RM night, corner, traces, periodogram",
  help: `Usage: rvwalk plot DIR [--out FOLDER] [--params a,b,...] [--burn N] [--draws N] [--png]

Writes into FOLDER (default DIR/plots) and prints the paths of:
  rv.svg             RVs per instrument, offsets subtracted, error bars with and
                     without the median jitter, the posterior median model with
                     the 68% band of posterior draws, and residuals (O − C)
  phase_<planet>.svg each planet folded on its period (phase 0 at conjunction),
                     the other planets, offsets and trend subtracted
  rm_<planet>.svg    for planets with a Rossiter–McLaughlin model: the transit
                     night with the Keplerian + RM model band
  corner.svg         1-D marginals and 68%/95% highest-density contours
  trace.svg          the log posterior and chosen parameters against step
  periodogram.svg    generalised Lomb–Scargle periodogram of the residuals

Options:
  --out FOLDER       where to write (created if missing)
  --params LIST      comma-separated keys or * globs for the corner and trace
                     plots, sampled or derived (b.period,b.msini_mjup,*.jitter);
                     default: each planet's period, semi-amplitude, eccentricity
                     and lambda
  --burn N           steps to discard from every walker (default: as summary)
  --draws N          posterior draws for the model bands (default 100)
  --png              also write PNG files, with headless Chromium if installed`,
  async run(args) {
    const { values, positionals } = parseOptions(args, {
      out: { type: "string" },
      params: { type: "string" },
      burn: { type: "string" },
      draws: { type: "string" },
      png: { type: "boolean" },
    }, { min: 1, max: 1, names: "DIR" });
    if (values.help) return say(this.help), 0;
    const dir = positionals[0]!;
    const outDir = values.out ?? `${dir.replace(/\/+$/, "")}/plots`;
    const draws = intOption(values.draws, "draws", 100, 1)!;
    const m = await readManifest(dir);
    const read = await readChain(dir, { walkers: m.walkers, columns: m.columns.length });
    if (read.stop === "corrupt") {
      warn(
        `warning: chain file damaged after step ${read.stepsOnDisk} (${read.detail}); plotting the valid part`,
      );
    }
    if (read.chain.steps === 0) {
      warn(`rvwalk plot: ${dir}: no steps written yet`);
      return 1;
    }
    const given = intOption(values.burn, "burn", undefined, 0);
    const burn = given ?? summarise(m, read.chain).burn;
    if (burn >= read.chain.steps) {
      throw new InputError(
        `found ${burn}: expected fewer than the ${read.chain.steps} steps written`,
        { field: "--burn" },
      );
    }
    const params = values.params?.split(",").map((s) => s.trim()).filter((s) => s !== "");
    const figures = runFigures(m, read.chain, { burn, draws, params });
    await Deno.mkdir(outDir, { recursive: true });
    const written: string[] = [];
    for (const f of figures) {
      const path = `${outDir}/${f.file}`;
      await Deno.writeTextFile(path, f.svg);
      written.push(path);
      say(`${path}  ${f.description}`);
    }
    say(
      `burn-in ${burn} steps${
        given === undefined ? " (chosen automatically; override with --burn N)" : ""
      }; ${(read.chain.steps - burn) * read.chain.walkers} draws after burn-in`,
    );
    if (values.png) {
      const raster = await findRasteriser();
      if (raster === undefined) {
        warn(
          "rvwalk plot: PNG needs headless Chromium (apt-get install chromium); SVG files written, PNG skipped",
        );
        return 0;
      }
      for (const path of written) {
        const png = path.replace(/\.svg$/, ".png");
        const err = await raster(path, png);
        if (err === undefined) say(png);
        else warn(`rvwalk plot: could not rasterise ${path}: ${err}`);
      }
    }
    return 0;
  },
};

/** Rasterise `svg` to `png`; returns undefined on success, else a one-line reason. */
type Rasteriser = (svg: string, png: string) => Promise<string | undefined>;

/**
 * An SVG rasteriser: an npm one only if already importable (none is in the
 * import map today, so this normally falls through), else headless Chromium.
 */
async function findRasteriser(): Promise<Rasteriser | undefined> {
  const npmName = "@resvg/resvg-js";
  try {
    const mod = await import(npmName);
    const Resvg = mod.Resvg ?? mod.default?.Resvg;
    if (typeof Resvg === "function") {
      return async (svg, png) => {
        try {
          const r = new Resvg(await Deno.readTextFile(svg), { fitTo: { mode: "zoom", value: 2 } });
          await Deno.writeFile(png, r.render().asPng());
          return undefined;
        } catch (err) {
          return (err as Error).message;
        }
      };
    }
  } catch {
    // not importable: try Chromium
  }
  const chromium = await findChromium();
  if (chromium === undefined) return undefined;
  return async (svg, png) => {
    const text = await Deno.readTextFile(svg);
    const w = /<svg[^>]*\swidth="([\d.]+)"/.exec(text)?.[1];
    const h = /<svg[^>]*\sheight="([\d.]+)"/.exec(text)?.[1];
    if (w === undefined || h === undefined) return "no width and height on the <svg> element";
    const abs = await Deno.realPath(svg);
    const absPng = png.startsWith("/") ? png : `${Deno.cwd()}/${png}`;
    const cmd = new Deno.Command(chromium, {
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--hide-scrollbars",
        "--force-device-scale-factor=2",
        `--screenshot=${absPng}`,
        `--window-size=${Math.ceil(Number(w))},${Math.ceil(Number(h))}`,
        `file://${abs}`,
      ],
      stdout: "null",
      stderr: "piped",
    });
    const r = await cmd.output();
    if (r.success) return undefined;
    const msg = new TextDecoder().decode(r.stderr).trim().split("\n").pop() ?? "";
    return `chromium exited with code ${r.code}: ${msg}`;
  };
}

async function findChromium(): Promise<string | undefined> {
  for (const p of ["/usr/bin/chromium", "/usr/bin/chromium-browser", "/usr/bin/google-chrome"]) {
    try {
      const s = await Deno.stat(p);
      if (s.isFile) return p;
    } catch {
      // not here
    }
  }
  return undefined;
}
