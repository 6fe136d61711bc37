/**
 * Inverse Fisher information of the smallest-extreme-value maximum-likelihood estimates (û, b̂)
 * from a complete sample, per observation and per unit b²: the large-sample covariance of
 * (û, b̂) is (b²/n)·[[V_uu, V_ub], [V_ub, V_bb]] (Lawless 2003, *Statistical Models and Methods for
 * Lifetime Data*, §5.2; Meeker & Escobar 1998, §8.4). The information per observation is
 * [[1, 1 − γ_E], [1 − γ_E, π²/6 + (1 − γ_E)²]] (γ_E Euler's constant); its determinant is π²/6.
 * Numerically (V_uu, V_ub, V_bb) = (1.1087, −0.2570, 0.6079). Dimensionless.
 */
const EULER_GAMMA = 0.5772156649015329;
const I_UB = 1 - EULER_GAMMA;
const I_BB = (Math.PI * Math.PI) / 6 + I_UB * I_UB;
const DET = I_BB - I_UB * I_UB; // = π²/6

export const SEV_INVERSE_INFORMATION = { uu: I_BB / DET, ub: -I_UB / DET, bb: 1 / DET } as const;
