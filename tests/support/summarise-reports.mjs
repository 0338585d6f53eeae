// Prints one line, "N passed, N failed", totalled over the vitest JSON reports in
// test-results/ (unit + integration, end-to-end). A suite that wrote no report counts as
// one failure, so a run that crashed early cannot look green.
import fs from "node:fs";

const expected = process.argv.slice(2);
let passed = 0;
let failed = 0;
for (const name of expected) {
  const file = `test-results/${name}.json`;
  if (!fs.existsSync(file)) {
    console.error(`[summary] ${file} is missing: counting the ${name} suite as failed`);
    failed += 1;
    continue;
  }
  const report = JSON.parse(fs.readFileSync(file, "utf8"));
  passed += report.numPassedTests ?? 0;
  failed += (report.numFailedTests ?? 0) + (report.success === false && !report.numFailedTests ? 1 : 0);
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed > 0 ? 1 : 0);
