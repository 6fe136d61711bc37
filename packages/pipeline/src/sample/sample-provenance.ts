/**
 * Provenance of a sample-stage export, with the same keys as a design curve's
 * (design/provenance.ts): the group, the number of tests and the SHA-256 of their ids, the
 * settings and their hash (SHA-256 of the settings as JSON with sorted keys), the code version,
 * the date (passed in; nothing here reads the clock) and the safety caution.
 */
import { hashOf } from '../hash.ts';
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import type { DesignProvenance } from '../design/types.ts';

export type SampleProvenance = Omit<DesignProvenance, 'settings'> & { settings: Record<string, unknown> };

export function sampleProvenance(
  model: { group: Record<string, string>; n_tests: number; test_ids_sha256: string },
  settings: Record<string, unknown>,
  codeVersion: string,
  generatedAt: string,
): SampleProvenance {
  return {
    group: { ...model.group },
    n_tests: model.n_tests,
    test_ids_sha256: model.test_ids_sha256,
    settings,
    settings_hash: hashOf(settings),
    code_version: codeVersion,
    generated_at: generatedAt,
    caution: DESIGN_VALUE_CAUTION,
  };
}
