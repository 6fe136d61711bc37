export * from './units.ts';
export * from './geometry.ts';
export * from './types.ts';
export * from './flags.ts';
export { DEFAULT_GRID, DEFAULT_REDUCE_SETTINGS, MODULUS_RANGE_GPA } from './settings.ts';
export { engineeringCurve, type EngineeringCurve, type StrainSource } from './engineering.ts';
export { fitLine, type LineFit } from './line-fit.ts';
export { fitModulusIterative, fitModulusWindow, type ModulusFit } from './modulus.ts';
export { compensateToe } from './toe.ts';
export { offsetYield, type Crossing } from './offset-yield.ts';
export { totalExtensionYield } from './total-extension-yield.ts';
export { findDiscontinuousYield, type DiscontinuousYield } from './discontinuous-yield.ts';
export { tensileValues, findFracture, type TensileResult } from './tensile.ts';
export { smoothMaximum, DROP_NOISE_SDS, type SmoothMaximum } from './smooth-maximum.ts';
export { trueCurve, engineeringToTrue } from './true-curve.ts';
export { hardeningExponent, hardeningWindow, type HardeningExponent } from './hardening-exponent.ts';
export {
  fitHollomon, fitSwift, fitVoce, fitRambergOsgood, evalHollomon, evalSwift, evalVoce, evalRambergOsgood, rambergOsgoodStress,
} from './law-fits.ts';
export { findUnloadLoops, type UnloadLoop } from './unload-loops.ts';
export { noiseSdMpa } from './noise.ts';
export { countSlips } from './slip.ts';
export { shapeClass } from './shape-class.ts';
export { resampleOnGrid } from './grid.ts';
export { reduceCurve, checkSettings } from './reduce.ts';
export { propertiesFromSummary, type SummaryInput } from './summary.ts';
