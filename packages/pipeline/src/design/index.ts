// Design stage: characteristic true stress – plastic strain curves per group, idealizations,
// engineering counterparts and generic CSV/JSON exports with provenance.
export * from './types.ts';
export { BAND_SEED, characteristicCurve, DesignInputError, type CharacteristicCurveInput } from './characteristic-curve.ts';
export { simultaneousLowerBand, type SimultaneousBand, type SimultaneousBandSpec } from './simultaneous-band.ts';
export { largestNonDecreasingBelow } from './non-decreasing-below.ts';
export { bandStatement } from './band-statement.ts';
export { lowerToleranceBound, type ToleranceBound, type ToleranceSpec } from './lower-tolerance-bound.ts';
export { validityRange, type ValidityRange, type ValidityLimit } from './validity-range.ts';
export { engineeringCounterpart } from './engineering-counterpart.ts';
export { fitBilinearHardening, type BilinearFit } from './idealize-bilinear.ts';
export { multilinearBreakpoints, type MultilinearPoints } from './idealize-multilinear.ts';
export { fitRambergOsgoodPlastic, rambergOsgoodPlasticStrain, rambergOsgoodStressAtPlastic, interpolateAt, RO_OFFSET, type RambergOsgoodFit } from './idealize-ramberg-osgood.ts';
export { fitLaw, extrapolateJoined, extrapolationPoints, fitWindowStart, type FittedLaw } from './extrapolate-law.ts';
export { designProvenance, designSettings, testIdsSha256 } from './provenance.ts';
export {
  type CommonFields,
  IDEALIZED_CSV_COLUMNS,
  designCurveToCsv,
  parseDesignCurveCsv,
  idealizedToCsv,
  parseIdealizedCsv,
  engineeringToCsv,
  parseEngineeringCsv,
  ENGINEERING_CSV_COLUMNS,
  ENGINEERING_CSV_TITLE,
  type EngineeringTable,
  CURVE_CSV_COLUMNS,
  CURVE_CSV_TITLE,
  IDEALIZED_CSV_TITLE,
  type DesignCurveTable,
  type IdealizedTable,
} from './export-csv.ts';
export { designCurveToJson, designCurvesToJson, parseDesignCurveJson, parseDesignCurvesJson } from './export-json.ts';
