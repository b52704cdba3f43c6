/**
 * The names of the files and folders a build writes, in one place: for the writers (render),
 * the readers (diff, `build --changed`, merge) and the pages that link to them. Users' CI
 * scripts depend on them: they are part of the output contract (README, "What a build writes").
 */

/** A product's (and the catalogue's) results, `<product_id>/results.json` and `results.csv`. */
export const RESULTS_JSON = 'results.json';
export const RESULTS_CSV = 'results.csv';
/** A product's declaration page, its audit trail and its printed declaration. */
export const DECLARATION_PAGE = 'index.html';
export const AUDIT_PAGE = 'audit.html';
export const DECLARATION_PDF = 'declaration.pdf';
/** The verification pack: input copies and the SHA-256 manifest of every output. */
export const VERIFICATION_DIR = 'verification';
export const MANIFEST_FILE = 'manifest.json';
/** The verifier's checklist of every product, in the verification pack (beside checklist.html). */
export const CHECKLIST_JSON = 'checklist.json';
/** The build cache `build --changed` reads. */
export const CACHE_FILE = '.loopsheet-cache.json';
/** What `build --shard K/N` records for `merge`. */
export const SHARD_RECORD = 'loopsheet-shard.json';
