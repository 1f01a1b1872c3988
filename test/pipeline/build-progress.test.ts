import { describe, expect, it } from 'vitest';
import { createProgress, formatDuration } from '../../src/pipeline/progress.ts';

function capture(isTTY: boolean) {
  const chunks: string[] = [];
  return { chunks, stream: { isTTY, columns: 120, write: (t: string) => chunks.push(t) } };
}

describe('progress', () => {
  it('prints a plain line at every 10 % step and a final line when not on a terminal', () => {
    const { chunks, stream } = capture(false);
    let t = 0;
    const p = createProgress({ label: 'extract', total: 100, stream, now: () => t });
    for (let i = 0; i < 100; i++) {
      t += 10; // 1 s in all: the 5 s rule never fires
      p.tick();
    }
    p.done('3 cached');
    const lines = chunks.join('').trimEnd().split('\n');
    // 10 %, 20 %, …, 90 % (the 100 % step is the final line), then the done line
    expect(lines.slice(0, -1)).toHaveLength(9);
    expect(lines[0]).toMatch(/^extract: 10\/100 \(10%\) eta \d+s$/);
    expect(lines.at(-1)).toBe('extract: 100/100 done in 1s (3 cached)');
    expect(chunks.join('')).not.toContain('\r');
  });

  it('prints a plain line after 5 s even when the step has not changed', () => {
    const { chunks, stream } = capture(false);
    let t = 0;
    const p = createProgress({ label: 'x', total: 1000, stream, now: () => t });
    p.tick(); // 0.1 %: nothing yet
    expect(chunks).toHaveLength(0);
    t = 6000;
    p.tick();
    expect(chunks).toEqual(['x: 2/1000 (0%) eta 49m54s\n']);
  });

  it('redraws one line with a bar, counts and ETA on a terminal', () => {
    const { chunks, stream } = capture(true);
    let t = 0;
    const p = createProgress({ label: 'extract', total: 4, stream, now: () => t });
    t = 1000;
    p.tick();
    expect(chunks[0]).toBe('\rextract [######------------------] 1/4 25% eta 3s\x1b[K');
    t = 1050; // throttled: under 100 ms since the last draw
    p.tick();
    expect(chunks).toHaveLength(1);
    t = 2000;
    p.tick(2);
    p.done();
    expect(chunks.at(-1)).toBe('\rextract: 4/4 done in 2s\x1b[K\n');
  });

  it('formats durations as seconds, minutes and hours', () => {
    expect(formatDuration(4.4)).toBe('4s');
    expect(formatDuration(65)).toBe('1m05s');
    expect(formatDuration(3 * 3600 + 60)).toBe('3h01m');
    expect(formatDuration(Number.NaN)).toBe('--');
  });
});
