/**
 * Where a figure or an input row is shown in the audit trail. One product's audit trail is
 * one page, `<product_id>/audit.html`; a figure's anchor is its results.json figure id, so a
 * verifier can go from results.json to the page and back by the same name.
 */
import { AUDIT_PAGE } from '../files.ts';

/** A URL fragment for an id (ids hold `/`, `:` and `&`, and user-chosen line ids may hold anything). */
export const fragment = (id: string): string => encodeURIComponent(id).replace(/%2F/g, '/').replace(/%3A/g, ':');

/** The anchor of a factor row on the factor table page. */
export const factorAnchor = (factorId: string) => `f-${encodeURIComponent(factorId).replace(/%/g, '_')}`;
/** A factor row on the factor table, from a page one folder deep (a declaration, the verification pack). */
export const factorHref = (factorId: string) => `../factors/index.html#${factorAnchor(factorId)}`;

/** The link to a figure from a page beside the audit page (the declaration page). */
export const figureHref = (figureId: string): string => `${AUDIT_PAGE}#${fragment(figureId)}`;

/** The anchor of an input row in the audit page's input section. */
export const inputAnchor = (file: string, line: number): string => `input:${file}:${line}`;
