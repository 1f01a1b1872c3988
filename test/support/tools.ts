/**
 * Availability of the Debian reference tools used by outside-check tests.
 * A missing tool makes its tests skip with a loud message, except under CI, where it fails.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';

export type ReferenceTool = 'ngspice' | 'scikit-rf' | 'scipy' | 'chromium';

/** Debian's interpreter (the python3 on PATH may be another one without the packages). */
export const DEBIAN_PYTHON = '/usr/bin/python3';

const cache = new Map<ReferenceTool, boolean>();

function probe(tool: ReferenceTool): boolean {
  try {
    switch (tool) {
      case 'ngspice':
        execFileSync('ngspice', ['-v'], { stdio: 'ignore', timeout: 20_000 });
        return true;
      case 'chromium':
        return existsSync('/usr/bin/chromium');
      case 'scikit-rf':
        execFileSync(
          DEBIAN_PYTHON,
          [
            '-c',
            'import numpy as np\nfor a,t in (("complex",complex),("float",float),("int",int),("bool",bool),("object",object)): a in np.__dict__ or setattr(np,a,t)\nimport skrf',
          ],
          { stdio: 'ignore', timeout: 60_000 },
        );
        return true;
      case 'scipy':
        execFileSync(DEBIAN_PYTHON, ['-c', 'import scipy.optimize'], { stdio: 'ignore', timeout: 60_000 });
        return true;
    }
  } catch {
    return false;
  }
}

/**
 * True when the tool is usable. When it is missing: throws under CI (so the run fails),
 * otherwise prints a loud notice and returns false (the caller skips its tests).
 */
export function requireTool(tool: ReferenceTool): boolean {
  if (!cache.has(tool)) cache.set(tool, probe(tool));
  const ok = cache.get(tool)!;
  if (!ok) {
    const msg = `REFERENCE TOOL MISSING: ${tool} (Debian package) — outside-check tests that need it are SKIPPED. Install: apt-get install ngspice python3-scikit-rf python3-scipy chromium`;
    if (process.env.CI) throw new Error(`${msg} (CI is set, so this is a failure)`);
    console.warn(`\n!!!!!!!!!!\n${msg}\n!!!!!!!!!!\n`);
  }
  return ok;
}

/** Python prelude that lets Debian's scikit-rf 0.15 import under numpy 1.24. */
export const SKRF_PRELUDE = [
  'import numpy as np',
  'for a,t in (("complex",complex),("float",float),("int",int),("bool",bool),("object",object)): a in np.__dict__ or setattr(np,a,t)',
  'import skrf',
].join('\n');
