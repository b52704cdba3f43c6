import { constants } from 'node:os';
import { cleanUpNow } from '../render/cleanup.ts';
import type { Io } from './io.ts';

/** The signals that stop a run from outside: Ctrl-C, a CI runner's cancel, a closed terminal. */
const STOP_SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

/**
 * Makes a stopped run say so and leave nothing behind: on SIGINT, SIGTERM or SIGHUP it prints
 * that it was interrupted, runs the cleanups (the unfinished staging folder, the browser, the
 * shard workers) and exits with 128 + the signal's number, as shells report a process killed
 * by that signal, so that a cancelled CI job is never green. A process started by the
 * `loopsheet` launcher (bin/loopsheet.js) also stops when the launcher dies, even by SIGKILL:
 * it notices the launcher's IPC channel closing.
 */
export function stopOnSignals(command: string, io: Io): void {
  let stopping = false;
  const stop = (why: string, code: number) => {
    if (stopping) return;
    stopping = true;
    io.err(`loopsheet ${command}: interrupted (${why})`);
    for (const line of cleanUpNow()) io.err(`  ${line}`);
    process.exit(code);
  };
  for (const signal of STOP_SIGNALS) process.on(signal, () => stop(signal, 128 + constants.signals[signal]));
  if (process.env.LOOPSHEET_LAUNCHED === '1' && process.channel) {
    // The channel must not keep the process alive; its closing still tells.
    process.channel.unref();
    process.on('disconnect', () => stop('the loopsheet process that started it has gone', 128 + constants.signals.SIGKILL));
  }
}
