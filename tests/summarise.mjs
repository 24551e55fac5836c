// Adds up the Vitest summary lines ("Tests  3 failed | 120 passed (123)") of every suite's log and
// prints one closing line "N passed, N failed". A suite whose log has no summary counts as a failure.
import { readFileSync } from 'node:fs';

let passed = 0;
let failed = 0;
for (const file of process.argv.slice(2)) {
  // eslint-disable-next-line no-control-regex
  const text = readFileSync(file, 'utf8').replace(/\u001b\[[0-9;]*m/g, '');
  const line = text.split('\n').reverse().find((l) => /^\s*Tests\s+/.test(l));
  if (!line) {
    console.log(`no test summary in ${file}: counted as one failure`);
    failed += 1;
    continue;
  }
  passed += Number(/(\d+) passed/.exec(line)?.[1] ?? 0);
  failed += Number(/(\d+) failed/.exec(line)?.[1] ?? 0);
}
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed > 0 ? 1 : 0);
