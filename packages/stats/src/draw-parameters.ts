/**
 * Parameter sets drawn from the large-sample normal law of the MLEs, N(θ̂, J⁻¹) (mle-covariance.ts),
 * to propagate the statistical uncertainty of a fit from n tests. The draw is made in the
 * parameters on the log scale where they must stay positive — (μ, ln σ) for the normal and the
 * lognormal, (ln k, ln λ) for the Weibull — with the covariance carried over by the delta method
 * (Cov(ln σ̂, ·) = Cov(σ̂, ·)/σ̂, …; Lawless 2003, §B.2), and mapped back, so no draw has a negative
 * scale or shape. Seeded (seeded-generators.ts): the same seed gives the same draws.
 *
 * In: the fit, its covariance (null: the parameters are held at the estimate), the number of draws.
 * Out: one parameter record per draw, in the fit's parameters and units.
 */
import type { FitResult } from './fit-types.ts';
import type { ParameterCovariance } from './mle-covariance.ts';
import { normalStream } from './seeded-generators.ts';

export function drawParameters(fit: Pick<FitResult, 'model' | 'params'>, cov: Pick<ParameterCovariance, 'parameters' | 'covariance'> | null, draws: number, seed: number): Record<string, number>[] {
  if (!cov) return Array.from({ length: draws }, () => ({ ...fit.params }));
  const [a, b] = cov.parameters;
  const logA = fit.model === 'weibull';
  const va = fit.params[a];
  const vb = fit.params[b];
  const da = logA ? 1 / va : 1;
  const db = 1 / vb;
  const saa = cov.covariance[0][0] * da * da;
  const sab = cov.covariance[0][1] * da * db;
  const sbb = cov.covariance[1][1] * db * db;
  // Cholesky factor of the 2 × 2 covariance on the transformed scale
  const l11 = Math.sqrt(saa);
  const l21 = l11 > 0 ? sab / l11 : 0;
  const l22 = Math.sqrt(Math.max(0, sbb - l21 * l21));
  const ta = logA ? Math.log(va) : va;
  const tb = Math.log(vb);
  const z = normalStream(seed);
  const out: Record<string, number>[] = [];
  for (let d = 0; d < draws; d++) {
    const z1 = z();
    const z2 = z();
    const xa = ta + l11 * z1;
    const xb = tb + l21 * z1 + l22 * z2;
    out.push({ [a]: logA ? Math.exp(xa) : xa, [b]: Math.exp(xb) });
  }
  return out;
}
