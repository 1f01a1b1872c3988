/** See site-data-copies.mjs. */
export declare const SITE_DATA_COPIES: ReadonlyArray<readonly [string, string]>;
