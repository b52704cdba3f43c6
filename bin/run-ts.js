#!/usr/bin/env node
// Runs a TypeScript script of this repository (benchmarks, doc generators) through tsx.
import { register } from 'tsx/esm/api';
import { pathToFileURL } from 'node:url';
import path from 'node:path';

register();
const script = process.argv[2];
if (!script) {
  process.stderr.write('usage: run-ts.js SCRIPT.ts [args…]\n');
  process.exit(2);
}
process.argv.splice(2, 1);
await import(pathToFileURL(path.resolve(script)).href);
