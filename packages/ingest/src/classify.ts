/**
 * What to do with a test read from a manifest, given the version stored under its identity
 * (lab, test_id): the decision of idempotent ingest.
 *   - nothing stored → `new`, version 1;
 *   - stored with the same content hash → `duplicate` (skipped; a re-run stores nothing twice);
 *   - stored with other content → `conflict` (rejected, the stored test untouched), or with
 *     `replace` → `replace`: version + 1 becomes current, the stored one is kept as history.
 * Pure; the hash is content-hash.ts's.
 */

export interface StoredTest {
  id: number;
  version: number;
  content_sha256: string;
}

export type Decision =
  | { kind: 'new'; version: 1 }
  | { kind: 'duplicate' }
  | { kind: 'conflict'; storedVersion: number }
  | { kind: 'replace'; version: number; supersedes: number };

export function classify(existing: StoredTest | undefined, hash: string, replace: boolean): Decision {
  if (!existing) return { kind: 'new', version: 1 };
  if (existing.content_sha256 === hash) return { kind: 'duplicate' };
  if (!replace) return { kind: 'conflict', storedVersion: existing.version };
  return { kind: 'replace', version: existing.version + 1, supersedes: existing.id };
}
