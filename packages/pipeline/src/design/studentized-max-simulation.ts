/**
 * Monte Carlo of the studentized maximum max_a T_a, T_a = (z̄_a + z_p)/s_a, where z̄_a and s_a
 * are the mean and SD, over the tests observed at grid point a, of standardized curves from a
 * Gaussian factor model: z_j(a) = l_a·ε_j + ρ_a·e_ja with ε_j ~ N(0, I_r) per test and e_ja ~ N(0, 1)
 * per test and point, all independent, ρ_a² = 1 − |l_a|².
 *
 * Nothing is simulated test by test: each replicate draws the sufficient statistics exactly.
 * Tests with the same set of observed points form a block; a block of m tests has Σε ~ N(0, m·I)
 * and Σεεᵀ = W + (Σε)(Σε)ᵀ/m with W ~ Wishart_r(m − 1, I) independent of Σε (Bartlett
 * decomposition, Anderson, *An Introduction to Multivariate Statistical Analysis*, 3rd ed., §7.2;
 * directly as a sum of m − 1 outer products when m − 1 < r). At a point with n tests, given the
 * factor parts f (F₁ = Σf, F₂ = Σf²), the noise sums (Σe, Σf·e) are normal with covariance the Gram
 * matrix [[n, F₁], [F₁, F₂]], and Σe² is the squared norm of their projection plus an independent
 * χ²_{n−2} (χ²_{n−1} where f is constant). The block sums are carried along the grid, adding the
 * blocks that start observing at a point and removing those that stop, so a replicate costs
 * O((blocks + points)·r²) for curves that end one after another, not O(tests × points).
 *
 * Random numbers: @stdlib's seeded Box–Muller normals and chi-square variates (MT19937).
 * In: loadings (points × r, row-major), r, the blocks (size and the points they observe), z_p,
 * replicates, seed. Out: the simulated maxima, sorted ascending.
 */
import boxMuller from '@stdlib/random-base-box-muller';
import chisquare from '@stdlib/random-base-chisquare';

export interface TestBlock {
  /** number of tests with this pattern */
  size: number;
  /** the points (indices into the loadings' rows) these tests are observed at */
  points: number[];
}

export function simulateStudentizedMaxima(loadings: Float64Array, r: number, blocks: readonly TestBlock[], zp: number, replicates: number, seed: number): Float64Array {
  const g = loadings.length / Math.max(1, r);
  const normal = boxMuller.factory({ seed });
  const chi2 = chisquare.factory({ seed: seed + 1 });
  const residual = Float64Array.from({ length: g }, (_, a) => {
    let s = 0;
    for (let k = 0; k < r; k++) s += loadings[a * r + k] ** 2;
    return Math.sqrt(Math.max(0, 1 - s));
  });
  // per point: the blocks that observe it, the number of tests there, and what changes from the
  // point before (the sums are carried along the grid: curves that end drop out, few change)
  const byPoint: number[][] = Array.from({ length: g }, () => []);
  blocks.forEach((b, i) => { for (const a of b.points) byPoint[a].push(i); });
  const nAt = byPoint.map((bs) => bs.reduce((s, i) => s + blocks[i].size, 0));
  const enter = byPoint.map((bs, a) => (a === 0 ? bs : bs.filter((i) => !byPoint[a - 1].includes(i))));
  const leave = byPoint.map((bs, a) => (a === 0 ? [] : byPoint[a - 1].filter((i) => !bs.includes(i))));

  const sums = blocks.map(() => new Float64Array(r));
  const squares = blocks.map(() => new Float64Array(r * r));
  const y = new Float64Array(r), A = new Float64Array(r * r);
  const acc = new Float64Array(r), accQ = new Float64Array(r * r);
  const addBlock = (i: number, sign: number) => {
    const s = sums[i], q = squares[i];
    for (let k = 0; k < r; k++) acc[k] += sign * s[k];
    for (let k = 0; k < r * r; k++) accQ[k] += sign * q[k];
  };
  const maxima = new Float64Array(replicates);
  for (let rep = 0; rep < replicates; rep++) {
    // block statistics: Σε and Σεεᵀ
    blocks.forEach((b, i) => {
      const s = sums[i], q = squares[i];
      q.fill(0);
      const sd = Math.sqrt(b.size);
      for (let k = 0; k < r; k++) s[k] = sd * normal();
      const dof = b.size - 1;
      if (dof >= r) {
        // Bartlett: W = A·Aᵀ, A lower triangular, A_kk² ~ χ²_{dof−k}, A_kl ~ N(0, 1) below
        A.fill(0);
        for (let k = 0; k < r; k++) {
          A[k * r + k] = Math.sqrt(chi2(dof - k));
          for (let l = 0; l < k; l++) A[k * r + l] = normal();
        }
        for (let k = 0; k < r; k++) for (let l = 0; l <= k; l++) {
          let v = 0;
          for (let m = 0; m <= l; m++) v += A[k * r + m] * A[l * r + m];
          q[k * r + l] = v;
          q[l * r + k] = v;
        }
      } else {
        for (let t = 0; t < dof; t++) {
          for (let k = 0; k < r; k++) y[k] = normal();
          for (let k = 0; k < r; k++) for (let l = 0; l < r; l++) q[k * r + l] += y[k] * y[l];
        }
      }
      for (let k = 0; k < r; k++) for (let l = 0; l < r; l++) q[k * r + l] += (s[k] * s[l]) / b.size;
    });
    let max = -Infinity;
    acc.fill(0); accQ.fill(0);
    for (let a = 0; a < g; a++) {
      for (const i of enter[a]) addBlock(i, 1);
      for (const i of leave[a]) addBlock(i, -1);
      const n = nAt[a];
      if (n < 2) continue;
      let f1 = 0, f2 = 0;
      for (let k = 0, o = a * r; k < r; k++) {
        f1 += loadings[o + k] * acc[k];
        let row = 0;
        for (let l = 0; l < r; l++) row += accQ[k * r + l] * loadings[o + l];
        f2 += loadings[o + k] * row;
      }
      // noise sums from the Gram matrix [[n, f1], [f1, f2]] (Cholesky) and the χ² remainder
      const rho = residual[a];
      const l11 = Math.sqrt(n), l21 = f1 / l11, spread = f2 - l21 * l21;
      const u1 = normal();
      let se = l11 * u1, sfe = l21 * u1, see = u1 * u1;
      if (spread > 1e-12 * Math.max(1, f2)) {
        const u2 = normal();
        sfe += Math.sqrt(spread) * u2;
        see += u2 * u2 + (n > 2 ? chi2(n - 2) : 0);
      } else see += chi2(n - 1);
      const s1 = f1 + rho * se, s2 = f2 + 2 * rho * sfe + rho * rho * see;
      const mean = s1 / n;
      const sdz = Math.sqrt(Math.max(0, (s2 - n * mean * mean) / (n - 1)));
      const t = (mean + zp) / sdz;
      if (t > max) max = t;
    }
    maxima[rep] = max;
  }
  return maxima.sort();
}
