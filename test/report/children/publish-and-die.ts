// Child process for the publish tests: publishes a tiny report into argv[2] for the handbook at
// argv[4]. argv[3] says what else happens: "rendering" or "between-renames" kill it with SIGKILL
// there, as `kill -9` would; "slow" writes argv[2] + ".started" once it renders, then takes 1.5 s.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { publish } from '../../../src/report/publish.ts';

const [out, where, root] = process.argv.slice(2) as [string, string, string];
const die = () => process.kill(process.pid, 'SIGKILL');
await publish(out, root, async (dir) => {
  writeFileSync(join(dir, 'index.html'), '<p>new report</p>');
  if (where === 'rendering') die();
  if (where === 'slow') {
    writeFileSync(`${out}.started`, '');
    await new Promise((r) => setTimeout(r, 1500));
  }
}, { betweenRenames: where === 'between-renames' ? die : undefined });
