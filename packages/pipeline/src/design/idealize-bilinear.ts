/**
 * Bilinear idealization: elastic to the yield, then linear hardening through the curve's first
 * point (ε_p0, σ_y). The hardening modulus H (slope of true stress on true plastic strain) is the
 * least-squares slope through that point, H = Σ Δε·Δσ / Σ Δε² with Δε = ε_p − ε_p0,
 * Δσ = σ − σ_y (ordinary least squares, any statistics text). The tangent modulus against total
 * strain follows as E·H/(E + H).
 *
 * Units: MPa, mm/mm. Degenerate input (no point beyond the first) gives H = 0.
 */
export interface BilinearFit {
  hardeningModulusMpa: number;
  tangentModulusMpa: number | null;
  /** Root-mean-square stress error over the points (MPa). */
  rmseMpa: number;
}

export function fitBilinearHardening(plasticStrain: readonly number[], stressMpa: readonly number[], yieldMpa: number, eMpa: number | null): BilinearFit {
  let sxy = 0;
  let sxx = 0;
  const x0 = plasticStrain[0] ?? 0;
  for (let i = 1; i < plasticStrain.length; i++) {
    const dx = plasticStrain[i] - x0;
    sxy += dx * (stressMpa[i] - yieldMpa);
    sxx += dx * dx;
  }
  const h = sxx > 0 ? sxy / sxx : 0;
  const tangent = eMpa !== null && eMpa > 0 && eMpa + h > 0 ? (eMpa * h) / (eMpa + h) : null;
  let sse = 0;
  for (let i = 0; i < plasticStrain.length; i++) sse += (stressMpa[i] - yieldMpa - h * (plasticStrain[i] - x0)) ** 2;
  const rmseMpa = plasticStrain.length > 0 ? Math.sqrt(sse / plasticStrain.length) : 0;
  return { hardeningModulusMpa: h, tangentModulusMpa: tangent, rmseMpa };
}
