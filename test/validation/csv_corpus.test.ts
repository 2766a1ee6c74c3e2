import { describe } from "vitest";
import { CSV_CASES } from "./_cases.ts";
import { corpusTests } from "./_corpus.ts";

describe("rvwalk check on bad data files", () => corpusTests(CSV_CASES));
