/**
 * The documented distribution export (docs/distribution-export.md, schema
 * docs/distribution-export.schema.json): one JSON document with the caution, what produced it,
 * and per group the distribution model (distribution-model.ts) with its provenance. Format name
 * and version are part of the document, so a reader can check what it reads.
 */
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import type { GroupDistribution } from './distribution-model.ts';
import { sampleProvenance, type SampleProvenance } from './sample-provenance.ts';
import type { DistributionStageResult } from './stage.ts';

export const DISTRIBUTION_EXPORT_FORMAT = 'fractile-distributions';
export const DISTRIBUTION_EXPORT_VERSION = 1;

export interface DistributionExport {
  format: typeof DISTRIBUTION_EXPORT_FORMAT;
  format_version: typeof DISTRIBUTION_EXPORT_VERSION;
  caution: string;
  code_version: string;
  generated_at: string;
  stats_run: number;
  sample_run: number;
  settings: Record<string, unknown>;
  groups: (GroupDistribution & { provenance: SampleProvenance })[];
}

export function distributionExport(result: Pick<DistributionStageResult, 'run' | 'stats_run' | 'settings' | 'models'>, codeVersion: string, generatedAt: string): DistributionExport {
  return {
    format: DISTRIBUTION_EXPORT_FORMAT,
    format_version: DISTRIBUTION_EXPORT_VERSION,
    caution: DESIGN_VALUE_CAUTION,
    code_version: codeVersion,
    generated_at: generatedAt,
    stats_run: result.stats_run,
    sample_run: result.run,
    settings: result.settings,
    groups: result.models.map((m) => ({ ...m, provenance: sampleProvenance(m, result.settings, codeVersion, generatedAt) })),
  };
}
