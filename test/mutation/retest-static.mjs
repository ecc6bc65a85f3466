// Usage: node test/mutation/retest-static.mjs [incremental file]
// (default reports/mutation/stryker-incremental.json)
//
// Drops from a Stryker incremental file every static mutant that was not detected, so the next
// incremental run tests it again. A static mutant (code run while a module loads, such as the
// quantity declarations) records no covering tests, so an incremental run sees "no covering test
// changed" and reuses its old result even after new tests were written for it (DEVELOPERS.md,
// "Mutation testing").
import fs from 'node:fs';

const file = process.argv[2] ?? 'reports/mutation/stryker-incremental.json';
const report = JSON.parse(fs.readFileSync(file, 'utf8'));
let dropped = 0;
for (const f of Object.values(report.files)) {
  const kept = f.mutants.filter((m) => !(m.static && !['Killed', 'Timeout', 'Ignored'].includes(m.status)));
  dropped += f.mutants.length - kept.length;
  f.mutants = kept;
}
fs.writeFileSync(file, JSON.stringify(report));
console.log(`${file}: ${dropped} undetected static mutants dropped; the next run tests them again`);
