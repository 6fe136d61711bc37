// SciPy for the monitoring checks: the snippet reads `data` and assigns `out` (see support/scipy.ts).
import { scipy as runScipy } from './support/scipy.ts';

export { SCIPY_PYTHON } from './support/scipy.ts';

export function scipy<T>(snippet: string, data: unknown): T {
  return runScipy<T>(`${snippet}\nprint(json.dumps(out))`, data);
}
