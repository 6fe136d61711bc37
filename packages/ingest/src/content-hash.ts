/**
 * Content hash of a test: SHA-256 over the canonical record (identity, metadata and every value in
 * canonical units, in a fixed order, as JSON) plus the SHA-256 of the curve file and of the column
 * map that reads it. Two ingests of the same content give the same hash wherever the files lie, so
 * a re-run is recognised as duplicate and a changed value or curve as a conflict.
 */
import { createHash } from 'node:crypto';
import type { ManifestRecord } from './manifest-reader.ts';

export function contentHash(r: ManifestRecord, curveSha256: string | null, mapSha256: string | null): string {
  const canonical = [
    ['lab', r.lab], ['test_id', r.testId], ['grade', r.grade], ['supplier', r.supplier], ['heat', r.heat],
    ['tested_on', r.testedOn], ['shape', r.shape], ['diameter_mm', r.diameterMm], ['thickness_mm', r.thicknessMm],
    ['width_mm', r.widthMm], ['area_mm2', r.areaMm2], ['gauge_length_mm', r.gaugeLengthMm], ['orientation', r.orientation],
    ['temperature_c', r.temperatureC],
    ['yield_mpa', r.summary?.yieldMpa ?? null], ['yield_definition', r.summary?.yieldDefinition ?? null],
    ['tensile_mpa', r.summary?.tensileMpa ?? null], ['uniform_elongation_pct', r.summary?.uniformElongationPct ?? null],
    ['elongation_pct', r.summary?.elongationPct ?? null],
    ['curve_sha256', curveSha256], ['map_sha256', curveSha256 === null ? null : mapSha256],
  ];
  return createHash('sha256').update(JSON.stringify(canonical)).digest('hex');
}
