import { describe } from "vitest";
import { SPEC_CASES } from "./_cases.ts";
import { corpusTests } from "./_corpus.ts";

describe("rvwalk check and run on bad specs and options", () => corpusTests(SPEC_CASES));
