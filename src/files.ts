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
/** A product's (and a family's) declaration as an ILCD+EPD archive, for programme operators and declaration databases. */
export const DECLARATION_ILCD = 'declaration.ilcd.zip';
/** The verification pack: input copies and the SHA-256 manifest of every output. */
export const VERIFICATION_DIR = 'verification';
export const MANIFEST_FILE = 'manifest.json';
/** The verifier's checklist of every product, in the verification pack (beside checklist.html). */
export const CHECKLIST_JSON = 'checklist.json';
/** The build cache `build --changed` reads. */
export const CACHE_FILE = '.loopsheet-cache.json';
/** What `build --shard K/N` records for `merge`. */
export const SHARD_RECORD = 'loopsheet-shard.json';
/** The catalogue's folders: the factor table, the families' declarations, the stylesheet and scripts. */
export const FACTORS_DIR = 'factors';
export const FAMILIES_DIR = 'families';
export const ASSETS_DIR = 'assets';
/** Marks a folder as loopsheet output, so a build only ever replaces its own output. */
export const OUTPUT_MARKER = '.loopsheet-output';

/**
 * Every name a build writes at the top of the output folder. A product's folder sits beside
 * them, so no product id may equal one (in any letter case: Windows and macOS do not tell
 * `Factors` from `factors`).
 */
export const TOP_LEVEL_NAMES: readonly string[] = [DECLARATION_PAGE, RESULTS_JSON, RESULTS_CSV, VERIFICATION_DIR, FACTORS_DIR, FAMILIES_DIR, ASSETS_DIR, CACHE_FILE, SHARD_RECORD, OUTPUT_MARKER];
