import cliProgress from 'cli-progress';
import type { Io } from './io.ts';

/**
 * Progress of a long build on stderr: on a terminal a bar (cli-progress) with the phase,
 * products done and the time left; in CI (no terminal, or CI=true) plain lines, one when a
 * phase starts and one at most every `everyMs` while products are built.
 */
export interface Progress {
  phase(name: string): void;
  products(done: number, total: number): void;
  stop(): void;
}

const seconds = (ms: number) => (ms >= 90_000 ? `${Math.round(ms / 60_000)} min` : `${Math.max(1, Math.round(ms / 1000))} s`);

export function createProgress(io: Io, options: { everyMs?: number; now?: () => number } = {}): Progress {
  const now = options.now ?? (() => performance.now());
  const everyMs = options.everyMs ?? 10_000;
  if (io.isTty) {
    const bar = new cliProgress.SingleBar(
      { format: '{phase} [{bar}] {value}/{total} products | {percentage} % | about {eta_formatted} left', stream: process.stderr, hideCursor: true, clearOnComplete: true, etaBuffer: 50 },
      cliProgress.Presets.shades_classic,
    );
    let started = false;
    let phase = '';
    return {
      phase(name) {
        phase = name;
        if (started) bar.update({ phase });
        else io.err(`${name}…`);
      },
      products(done, total) {
        if (!started) {
          bar.start(total, done, { phase });
          started = true;
        } else bar.update(done, { phase });
        if (done >= total) {
          bar.stop();
          started = false;
        }
      },
      stop() {
        if (started) bar.stop();
        started = false;
      },
    };
  }
  let phaseStart = now();
  let last = -Infinity;
  return {
    phase(name) {
      phaseStart = now();
      last = -Infinity;
      io.err(`build: ${name}`);
    },
    products(done, total) {
      const t = now();
      if (done < total && t - last < everyMs) return;
      if (done === total && total === 0) return;
      last = t;
      const elapsed = t - phaseStart;
      const left = done > 0 && done < total ? `, about ${seconds((elapsed / done) * (total - done))} left` : '';
      io.err(`build: ${done}/${total} products (${Math.round((100 * done) / Math.max(total, 1))} %)${left}`);
    },
    stop() {},
  };
}
