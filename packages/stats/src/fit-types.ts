/**
 * Result of fitting a two-parameter distribution by maximum likelihood, with its Anderson–Darling
 * goodness of fit. Parameters, by model (unit of the data = "u"):
 *   normal:    { mu [u], sigma [u] }                     — sigma is the MLE (divisor n)
 *   lognormal: { mu [ln u], sigma [-] }                  — of ln x, location fixed at 0
 *   weibull:   { shape [-], scale [u] }                  — two-parameter, location fixed at 0
 */
export type ModelName = 'normal' | 'lognormal' | 'weibull';

export interface FitResult {
  model: ModelName;
  params: Record<string, number>;
  /** Anderson–Darling statistic A² (unmodified). */
  ad: number;
  /** Upper-tail p-value of A² with parameters estimated; null when it cannot be given. */
  p: number | null;
  /** How `p` was obtained: a closed-form approximation, table interpolation, or a table bound. */
  p_method: 'stephens-formula' | 'table-interpolated' | 'table-bound';
  /** Maximized log-likelihood on the scale of the data (densities in 1/u). */
  loglik: number;
  /** Akaike information criterion, 2·2 − 2·loglik. */
  aic: number;
  /** Number of observations used. */
  n: number;
}
