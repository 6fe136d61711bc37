/**
 * What a characteristic curve bounds, in words, for every export and the report: the band kind
 * (`pointwise` or `simultaneous`), the coverage p and the confidence γ.
 */
import type { BandKind } from './types.ts';

export function bandStatement(kind: BandKind, coverage: number, confidence: number): string {
  const p = `${+(coverage * 100).toFixed(4)} %`, g = `${+(confidence * 100).toFixed(4)} %`;
  return kind === 'pointwise'
    ? `pointwise: at each plastic strain separately, at least ${p} of the population lies above characteristic_mpa with ${g} confidence; the curve as a whole is not covered with that confidence`
    : `simultaneous: with ${g} confidence, characteristic_mpa lies below the population's lower ${p} fractile at every plastic strain of the valid range at once`;
}
