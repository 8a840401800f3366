// Reads vitest's JSON reports and prints "N passed, N failed" per suite and in all. A file that
// failed without a failing test (an error while loading it, a setup that broke) counts as a failure.
const fs = require('fs');
function count(file) {
  let r;
  try {
    r = JSON.parse(fs.readFileSync(file, 'utf8'));
  } catch {
    return { passed: 0, failed: 1 };
  }
  const brokenFiles = (r.testResults || []).filter((t) => t.status === 'failed' && !(t.assertionResults || []).some((a) => a.status === 'failed')).length;
  const noFiles = (r.testResults || []).length === 0 ? 1 : 0;
  return { passed: r.numPassedTests, failed: r.numFailedTests + brokenFiles + noFiles };
}
const files = process.argv.slice(2);
if (files.length === 1) {
  const c = count(files[0]);
  console.log(`${c.passed} passed, ${c.failed} failed`);
} else {
  let p = 0, f = 0;
  for (const file of files) {
    const c = count(file);
    p += c.passed;
    f += c.failed;
  }
  console.log(`${p} passed, ${f} failed`);
}
