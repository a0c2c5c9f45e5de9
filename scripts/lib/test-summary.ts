/** Adds up vitest JSON reports into one closing line: "tests: N passed, N failed, N skipped". */
import { existsSync, readFileSync } from 'node:fs';

let passed = 0;
let failed = 0;
let skipped = 0;
let missing = 0;
for (const file of process.argv.slice(2)) {
  if (!existsSync(file)) {
    console.log(`[plenum] no report from ${file} (that runner did not finish)`);
    missing++;
    continue;
  }
  const r = JSON.parse(readFileSync(file, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
    numTodoTests: number;
    numFailedTestSuites: number;
  };
  passed += r.numPassedTests;
  failed += r.numFailedTests + (r.numFailedTestSuites > 0 && r.numFailedTests === 0 ? r.numFailedTestSuites : 0);
  skipped += r.numPendingTests + r.numTodoTests;
}
console.log(`tests: ${passed} passed, ${failed + missing} failed, ${skipped} skipped`);
process.exit(failed + missing > 0 || passed === 0 ? 1 : 0);
