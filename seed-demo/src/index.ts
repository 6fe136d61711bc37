/**
 * @fractile/seed-demo — the invented demo scenario and its generator.
 */
export { generateDemo } from './generate-demo.ts';
export type { DemoOptions, DemoManifest, DemoManifestEntry, DemoCounts } from './generate-demo.ts';
export { generateBenchmarkSet } from './benchmark-set.ts';
export type { BenchmarkOptions, BenchmarkSet } from './benchmark-set.ts';
export { REJECTION_CODES } from './problem-files.ts';
export type { ExpectedRejection, RejectionCode } from './problem-files.ts';
export { FABRICATOR, GRADES, MILLS, DRIFT, WINDOW_START, WINDOW_END, catalogJson } from './scenario.ts';
export type { GradeDef, MillDef, CurveLayout, SpecLimits } from './scenario.ts';
export { lawTrueStress } from './hardening-laws.ts';
export type { HardeningLaw, PlateauSwiftLaw, RambergOsgoodLaw, VoceLaw } from './hardening-laws.ts';
export { buildEngineeringCurve } from './engineering-curve.ts';
export type { EngineeringCurve, CurveTruth, NeckingSpec } from './engineering-curve.ts';
export { generateCurveCsv } from './generate-curve-csv.ts';
export type { CurveCsvOptions } from './generate-curve-csv.ts';
export { FOREIGN_COLUMN_MAP, layoutHeader } from './curve-format.ts';
export { Rng, mixSeed } from './random.ts';
