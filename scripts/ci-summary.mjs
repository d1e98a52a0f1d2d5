// Prints CI's closing line from vitest's JSON report and the notebook runner's results.
// Exit code 1 when anything failed or nothing ran.
import { existsSync, readFileSync } from 'node:fs';

const [testsPath, notebooksPath] = process.argv.slice(2);
let passed = 0, failed = 0, skipped = 0;
if (testsPath && existsSync(testsPath)) {
  const r = JSON.parse(readFileSync(testsPath, 'utf8'));
  passed += r.numPassedTests ?? 0;
  failed += r.numFailedTests ?? 0;
  skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
  // a test file that fails to load has no failed assertions of its own: count it once
  for (const suite of r.testResults ?? []) {
    const failedInside = (suite.assertionResults ?? []).some((a) => a.status === 'failed');
    if (suite.status === 'failed' && !failedInside) { failed += 1; console.log(`test file failed to run: ${suite.name}`); }
  }
} else {
  failed += 1;
  console.log(`no test report at ${testsPath}`);
}
if (notebooksPath && existsSync(notebooksPath)) {
  const nb = JSON.parse(readFileSync(notebooksPath, 'utf8'));
  for (const row of nb) { if (row.ok) passed += 1; else { failed += 1; console.log(`notebook failed: ${row.notebook}`); } }
} else {
  failed += 1;
  console.log(`no notebook results at ${notebooksPath}`);
}
console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 || passed === 0 ? 1 : 0);
