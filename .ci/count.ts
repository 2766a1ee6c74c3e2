// Prints vitest's JSON report as one plain line: "N passed, N failed, N skipped".
const r = JSON.parse(Deno.readTextFileSync(Deno.args[0]!));
console.log(
  `${r.numPassedTests} passed, ${r.numFailedTests} failed, ${r.numPendingTests ?? 0} skipped`,
);
