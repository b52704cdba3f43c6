import type { VerificationStatus } from '../model/verification-status.ts';

/** A declaration's verification status as the pages print it. */
export interface VerificationView {
  status: 'verified' | 'draft';
  draft: boolean;
  /** "verified by … on …" or "draft — …". */
  text: string;
  reasons: string[];
  /** The date of verification of a verified declaration; empty for a draft. */
  date: string;
}

export const verificationView = (status: VerificationStatus): VerificationView => ({
  status: status.status,
  draft: status.status !== 'verified',
  text: status.status === 'verified' ? `verified by ${status.verifier} on ${status.date}` : `draft — not verified${status.reasons.length ? ` (${status.reasons.join('; ')})` : ''}`,
  reasons: status.reasons,
  date: status.status === 'verified' ? (status.date ?? '') : '',
});
