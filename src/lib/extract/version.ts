/**
 * Version of the extraction results. Raise it whenever a change to the readers, the
 * extraction engine or the published data changes what a build emits for the same records:
 * every cached result of the older version is then recomputed (src/pipeline/cache.ts).
 */
export const EXTRACTOR_VERSION = '4';
