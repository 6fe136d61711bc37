/**
 * Reads the current version of every test in batches, with curve channels as Float64Array (in
 * canonical units: s, N, mm, MPa, mm/mm; `null` for a channel the file did not have) and the
 * summary values as given. Keyset pagination on the test row id (no OFFSET), so each batch costs
 * the same however far the scan has gone and a sharded database can run it per shard.
 *
 * Engineering stress and strain are NOT derived here: a force–extension curve comes with
 * `areaMm2` (S0) and `gaugeLengthMm` (L0) and the reduce stage converts it.
 */
import type { Kysely } from 'kysely';
import { channelFromBytes } from './channel-bytes.ts';
import type { YieldDefinition } from '@fractile/curves';
import type { Database, SpecimenShapeCode } from './schema.ts';

export interface StoredCurve {
  nPoints: number;
  timeS: Float64Array | null;
  forceN: Float64Array | null;
  extensionMm: Float64Array | null;
  crossheadMm: Float64Array | null;
  stressMpa: Float64Array | null;
  strain: Float64Array | null;
  sourceSha256: string;
  sourcePath: string;
}

export interface StoredSummary {
  yieldMpa: number | null;
  yieldDefinition: YieldDefinition | null;
  tensileMpa: number | null;
  uniformElongationPct: number | null;
  elongationPct: number | null;
}

export interface CurrentTest {
  rowId: number;
  lab: string;
  testId: string;
  version: number;
  grade: string;
  supplier: string;
  heat: string | null;
  testedOn: string;
  shape: SpecimenShapeCode | null;
  diameterMm: number | null;
  thicknessMm: number | null;
  widthMm: number | null;
  areaMm2: number | null;
  gaugeLengthMm: number | null;
  orientation: string | null;
  temperatureC: number | null;
  contentSha256: string;
  curve: StoredCurve | null;
  summary: StoredSummary | null;
}

export interface IterateOptions {
  batchSize?: number;
  grade?: string;
  supplier?: string;
  /** start after this test row id (resume a scan) */
  afterRowId?: number;
  /** only these row ids */
  rowIds?: readonly number[];
}

const f64 = (a: Uint8Array | null): Float64Array | null => (a === null ? null : channelFromBytes(a));

export async function* iterateCurrentTests(db: Kysely<Database>, opts: IterateOptions = {}): AsyncGenerator<CurrentTest[]> {
  const batchSize = Math.max(1, Math.floor(opts.batchSize ?? 500));
  let after = opts.afterRowId ?? 0;
  for (;;) {
    let q = db
      .selectFrom('tests as t')
      .innerJoin('grades as g', 'g.id', 't.grade_id')
      .innerJoin('suppliers as s', 's.id', 't.supplier_id')
      .leftJoin('heats as h', 'h.id', 't.heat_id')
      .leftJoin('curves as c', 'c.test_row_id', 't.id')
      .leftJoin('summary_records as r', 'r.test_row_id', 't.id')
      .select([
        't.id', 't.lab', 't.test_id', 't.version', 'g.code as grade', 's.name as supplier', 'h.code as heat', 't.tested_on',
        't.shape', 't.diameter_mm', 't.thickness_mm', 't.width_mm', 't.area_mm2', 't.gauge_length_mm', 't.orientation',
        't.temperature_c', 't.content_sha256',
        'c.test_row_id as curve_row', 'c.n_points', 'c.time_s', 'c.force_n', 'c.extension_mm', 'c.crosshead_mm', 'c.stress_mpa',
        'c.strain', 'c.source_sha256', 'c.source_path',
        'r.test_row_id as summary_row', 'r.yield_mpa', 'r.yield_definition', 'r.tensile_mpa', 'r.uniform_elongation_pct', 'r.elongation_pct',
      ])
      .where('t.is_current', '=', true)
      .where('t.id', '>', after);
    if (opts.grade !== undefined) q = q.where('g.code', '=', opts.grade);
    if (opts.supplier !== undefined) q = q.where('s.name', '=', opts.supplier);
    if (opts.rowIds !== undefined) {
      if (opts.rowIds.length === 0) return;
      q = q.where('t.id', 'in', [...opts.rowIds]);
    }
    const rows = await q.orderBy('t.id').limit(batchSize).execute();
    if (rows.length === 0) return;
    yield rows.map((r) => ({
      rowId: r.id,
      lab: r.lab,
      testId: r.test_id,
      version: r.version,
      grade: r.grade,
      supplier: r.supplier,
      heat: r.heat,
      testedOn: r.tested_on,
      shape: r.shape,
      diameterMm: r.diameter_mm,
      thicknessMm: r.thickness_mm,
      widthMm: r.width_mm,
      areaMm2: r.area_mm2,
      gaugeLengthMm: r.gauge_length_mm,
      orientation: r.orientation,
      temperatureC: r.temperature_c,
      contentSha256: r.content_sha256,
      curve:
        r.curve_row === null
          ? null
          : {
              nPoints: r.n_points!,
              timeS: f64(r.time_s),
              forceN: f64(r.force_n),
              extensionMm: f64(r.extension_mm),
              crossheadMm: f64(r.crosshead_mm),
              stressMpa: f64(r.stress_mpa),
              strain: f64(r.strain),
              sourceSha256: r.source_sha256!,
              sourcePath: r.source_path!,
            },
      summary:
        r.summary_row === null
          ? null
          : {
              yieldMpa: r.yield_mpa,
              yieldDefinition: r.yield_definition,
              tensileMpa: r.tensile_mpa,
              uniformElongationPct: r.uniform_elongation_pct,
              elongationPct: r.elongation_pct,
            },
    }));
    after = rows[rows.length - 1].id;
    if (rows.length < batchSize) return;
  }
}
