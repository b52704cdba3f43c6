import { readFileSync } from 'node:fs';

/** The tool's own name and version, as recorded in outputs so a verifier knows what made them. */
const manifest = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { name: string; version: string };
export const TOOL_NAME = manifest.name;
export const TOOL_VERSION = manifest.version;
