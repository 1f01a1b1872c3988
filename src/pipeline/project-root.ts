import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The project root: where astro.config.mjs and node_modules are. */
export const PROJECT_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
