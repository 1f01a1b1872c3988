// Where the catalogue data folder's published files go in the built site: [site path, data path].
// One list for the site generator's configuration (astro.config.mjs copies them after its build)
// and for the build's incremental path (partial-site.ts places them without the generator).
// Plain JavaScript: astro.config.mjs loads it before any TypeScript loader.

/** @type {ReadonlyArray<readonly [string, string]>} */
export const SITE_DATA_COPIES = [
  ['data/index.json', 'index.json'],
  ['data/compare', 'compare'],
  ['downloads', 'downloads'],
  ['catalogue.csv', 'catalogue.csv'],
  ['catalogue.json', 'catalogue.json'],
];
