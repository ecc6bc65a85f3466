// Child process for the publish tests: publishes a tiny report into argv[2] and kills itself with
// SIGKILL at the point argv[3] names ("rendering" or "between-renames"), as `kill -9` would.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { publish } from '../../../src/report/publish.ts';

const [out, where, root] = process.argv.slice(2) as [string, string, string];
const die = () => process.kill(process.pid, 'SIGKILL');
await publish(out, root, async (dir) => {
  writeFileSync(join(dir, 'index.html'), '<p>new report</p>');
  if (where === 'rendering') die();
}, { betweenRenames: where === 'between-renames' ? die : undefined });
