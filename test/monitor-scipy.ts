// SciPy for the monitoring checks: the snippet reads `data` and assigns `out` (see support/scipy.ts).
import { scipy as runScipy } from './support/scipy.ts';

export { SCIPY_PYTHON } from './support/scipy.ts';

export function scipy<T>(snippet: string, data: unknown): T {
  return runScipy<T>(`${snippet}\nprint(json.dumps(out))`, data);
}

/**
 * Zero-state ARL of a one-sided tabular CUSUM by the Markov chain of Brook & Evans (1972,
 * Biometrika 59:539), m states, in Python with scipy.stats.norm.cdf and numpy's solver; defines
 * `cusum_one_sided(k, h, shift)`.
 */
export const CUSUM_ONE_SIDED_PY = `
def cusum_one_sided(k, h, shift, m=400):
    w = 2*h/(2*m-1); c = np.arange(m)*w
    d = c[None,:]-c[:,None]+k-shift
    P = stats.norm.cdf(d+w/2) - stats.norm.cdf(d-w/2)
    P[:,0] = stats.norm.cdf(w/2-c+k-shift)
    return float(np.linalg.solve(np.eye(m)-P, np.ones(m))[0])
`;
