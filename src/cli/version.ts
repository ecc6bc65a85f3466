// The tool's version, from its package.json (read once; nothing else is loaded for `--version`).
import { readFileSync } from 'node:fs';

export const TOOL_VERSION: string = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version;
