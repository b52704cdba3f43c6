#!/usr/bin/env node
// The `loopsheet` command. The source is TypeScript, run through tsx's loader so a clone
// works without a compile step; the loader is resolved from this file, not from the
// user's working directory.
import { register } from 'tsx/esm/api';

register();
// `loopsheet check --json | head` closes the pipe early: that is not a failure.
for (const stream of [process.stdout, process.stderr]) {
  stream.on('error', (error) => {
    if (error.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    throw error;
  });
}
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
