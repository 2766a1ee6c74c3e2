import { describe, expect, test } from "vitest";
import { parseRvCsv } from "../../src/data/mod.ts";
import { InputError } from "../../src/errors.ts";

const file = "rv.csv";
const parse = (text: string) => parseRvCsv(text, { file });
const failure = (text: string): string => {
  try {
    parse(text);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
  throw new Error("expected an InputError");
};

describe("parseRvCsv()", () => {
  test("parseRvCsv() reads columns in any order and skips comments", () => {
    const t = parse("# note\ninstrument,time,rv,rv_err\nA,2.5,-3.25,1.5\nB,1.0,4,2\n");
    expect(Array.from(t.time)).toEqual([1.0, 2.5]);
    expect(Array.from(t.rv)).toEqual([4, -3.25]);
    expect(Array.from(t.rvErr)).toEqual([2, 1.5]);
    expect(t.instrumentName).toEqual(["B", "A"]);
    expect(t.source.map((s) => s.line)).toEqual([4, 3]);
    expect(t.notes.join()).toMatch(/sorted by time/);
  });

  test("parseRvCsv() names file, line and field for bad values", () => {
    const head = "time,rv,rv_err,instrument\n";
    expect(failure(head + "1,2,3,A\n2,abc,1,A\n")).toBe(
      "rv.csv:3: rv: found `abc`: expected a finite number",
    );
    expect(failure(head + "1,NaN,1,A\n")).toMatch(/^rv\.csv:2: rv: found `NaN`/);
    expect(failure(head + "1,Infinity,1,A\n")).toMatch(/rv\.csv:2: rv: found `Infinity`/);
    expect(failure(head + "1,2,0,A\n")).toMatch(
      /rv\.csv:2: rv_err: found 0: expected an error > 0/,
    );
    expect(failure(head + "1,2,-1,A\n")).toMatch(/rv_err: found -1/);
    expect(failure(head + "1,2,,A\n")).toMatch(/rv_err: found an empty field/);
    expect(failure(head + "1,2,1\n")).toMatch(/rv\.csv:2: row has 3 fields: expected 4/);
    expect(failure(head + "1,2,1,A,9\n")).toMatch(/row has 5 fields/);
    expect(failure(head + "1,2,1,A\n" + head + "2,2,1,A\n")).toMatch(/rv\.csv:3: header repeated/);
  });

  test("parseRvCsv() rejects bad headers and empty files", () => {
    expect(failure("")).toMatch(/file is empty/);
    expect(failure("time,rv,rv_err,instrument\n")).toMatch(/header but no data rows/);
    expect(failure("time,rv,instrument\n1,2,A\n")).toMatch(/missing column `rv_err`/);
    expect(failure("time,rv,rv,rv_err,instrument\n")).toMatch(/column `rv` appears twice/);
    expect(failure("time,rv,rv_err,instrument,snr\n1,2,1,A,5\n")).toMatch(/unknown column `snr`/);
  });

  test("parseRvCsv() keeps and reports duplicate times", () => {
    const t = parse("time,rv,rv_err,instrument\n1,2,1,A\n1,3,1,B\n");
    expect(t.time.length).toBe(2);
    expect(t.notes.join()).toMatch(/1 rows share a time/);
  });
});
