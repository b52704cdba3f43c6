/**
 * The headline of a declaration, defined once: the figures a declaration page leads with,
 * the catalogue lists, a family compares its members by, and the sensitivity and Monte Carlo
 * analyses study. GWP-total (EN 15804+A2 core indicator, climate change – total) of cradle to
 * gate (A1-A3) and of module D, which is reported apart and never added to A–C.
 */
export const HEADLINE_INDICATOR = 'GWP-total';
export const HEADLINE_MODULE = 'A1-A3';
export const HEADLINE_MODULE_D = 'D';
