#!/usr/bin/env node
// Entry point: TypeScript sources run through tsx, so `npx plumbline` works right after install
// with no build step.
import { register } from 'tsx/esm/api';
import process from 'node:process';

register();
const { run } = await import('../src/cli/main.ts');
const code = await run(process.argv.slice(2), {
  out: (s) => process.stdout.write(s + '\n'),
  err: (s) => process.stderr.write(s + '\n'),
});
process.exitCode = code;
