/**
 * Test and benchmark helpers of the curves package, kept out of its main entry: a seeded random
 * source and synthetic force–extension curves from known laws (the cases the reduction is checked
 * against).
 */
export {
  seededRandom, seededNormal, rambergOsgoodCurve, hollomonCurve, plateauCurve, bilinearCurve, type SyntheticCommon, type SyntheticCurve,
} from './synthetic.ts';
