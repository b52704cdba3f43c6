import { describe, expect, it } from 'vitest';
import { createProgress } from '../../src/cli/progress.ts';

describe('build progress without a terminal (CI)', () => {
  it('prints a line per phase and at most one per interval while products are built, with the time left', () => {
    const lines: string[] = [];
    let clock = 0;
    const progress = createProgress({ out: () => {}, err: (text) => lines.push(text), isTty: false }, { everyMs: 10_000, now: () => clock });
    progress.phase('calculate and render');
    for (let done = 1; done <= 100; done++) {
      clock += 1_000; // one product a second
      progress.products(done, 100);
    }
    progress.stop();
    expect(lines[0]).toBe('build: calculate and render');
    // The first product, then every 10 s (11, 21, …, 91), then the last: 1 + 9 + 1 lines.
    expect(lines.slice(1)).toHaveLength(11);
    expect(lines[1]).toBe('build: 1/100 products (1 %), about 2 min left');
    expect(lines[2]).toBe('build: 11/100 products (11 %), about 89 s left');
    expect(lines.at(-1)).toBe('build: 100/100 products (100 %)');
  });
});
