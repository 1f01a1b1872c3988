/** The generated catalogue data the site renders: the report layer's types (src/lib/report/types.ts). */
export * from '../lib/report/types.ts';
