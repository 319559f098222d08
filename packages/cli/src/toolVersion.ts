import { readFileSync } from 'node:fs';

/** The CLI's version, from its package.json (shown by `--version`, in reports and pages). */
export const TOOL_VERSION = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;
