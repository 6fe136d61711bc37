/**
 * Provenance of a design curve: the group, how many tests entered it and a SHA-256 (FIPS 180-4)
 * of their ids (sorted, joined by "\n"), the settings and their hash (SHA-256 of the settings as
 * JSON with sorted keys), the code version, the run date and the safety caution. The date and
 * version are passed in; nothing here reads the clock.
 */
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import { hashOf, sha256Hex } from '../hash.ts';
import type { DesignOptions, DesignProvenance, DesignSettings, ProvenanceInput } from './types.ts';

/** SHA-256 of the ids sorted by code unit and joined by "\n". */
export function testIdsSha256(ids: readonly string[]): string {
  return sha256Hex([...ids].sort().join('\n'));
}

export function designSettings(opts: DesignOptions, extra?: ProvenanceInput['extra_settings']): DesignSettings {
  const settings: DesignSettings = {
    coverage: opts.coverage,
    confidence: opts.confidence,
    model: opts.model,
    extrapolate: opts.extrapolate,
    multilinear_points: opts.multilinearPoints,
    min_tests_per_point: opts.minTestsPerPoint,
  };
  if (opts.extrapolateTo !== undefined) settings.extrapolate_to = opts.extrapolateTo;
  settings.band = opts.band ?? 'pointwise';
  if (settings.band === 'simultaneous') settings.band_simulations = opts.bandSimulations ?? 2000;
  for (const [k, v] of Object.entries(extra ?? {})) if (!(k in settings)) settings[k] = v;
  return settings;
}

export function designProvenance(group: Record<string, string>, testIds: readonly string[], opts: DesignOptions, input: ProvenanceInput): DesignProvenance {
  const settings = designSettings(opts, input.extra_settings);
  return {
    group: { ...group },
    n_tests: testIds.length,
    test_ids_sha256: testIdsSha256(testIds),
    settings,
    settings_hash: hashOf(settings),
    code_version: input.code_version,
    generated_at: input.generated_at,
    caution: DESIGN_VALUE_CAUTION,
  };
}
