import { describe, expect, it } from 'vitest';
import { parseBuildArgs, run } from '../../scripts/cli/build.ts';

describe('motional build arguments', () => {
  it('reads every option, in both --flag value and --flag=value forms', () => {
    expect(
      parseBuildArgs([
        '--content',
        'c',
        '--out=o',
        '--base',
        '/tools/crystals/',
        '--jobs',
        '2',
        '--no-cache',
        '--quiet',
      ]),
    ).toEqual({
      options: { contentDir: 'c', outDir: 'o', base: '/tools/crystals/', jobs: 2, cache: false },
      quiet: true,
      summaryFile: undefined,
    });
  });

  it('rejects bad values with a message naming the value and what was expected', () => {
    expect(parseBuildArgs(['--jobs', '0'])).toEqual({ usage: '--jobs expects a whole number from 1 to 256, got "0"' });
    expect(parseBuildArgs(['--base', 'tools'])).toEqual({
      usage: `--base expects a path starting with '/', e.g. /tools/crystals/, got "tools"`,
    });
    expect(parseBuildArgs(['--out'])).toEqual({ usage: '--out needs a value' });
    expect(parseBuildArgs(['--fast'])).toEqual({ usage: 'unknown option "--fast"' });
    expect(parseBuildArgs(['content'])).toEqual({ usage: 'unexpected argument "content"' });
  });

  it('exits 2 on a usage error and 0 for --help, printing the usage', async () => {
    const out: string[] = [];
    const err: string[] = [];
    const io = { out: (t: string) => void out.push(t), err: (t: string) => void err.push(t) };
    expect(await run(['--jobs', 'x'], io)).toBe(2);
    expect(err.join('')).toMatch(/^motional build: --jobs expects .*\n\nusage: motional build/);
    expect(await run(['--help'], io)).toBe(0);
    expect(out.join('')).toMatch(/^usage: motional build \[--content DIR\] \[--out DIR\]/);
  });
});
