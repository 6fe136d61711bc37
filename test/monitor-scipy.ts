// Runs a Python snippet with SciPy (Debian's interpreter) on JSON input and returns its JSON
// output. The snippet reads `data` and assigns `out`.
import { spawnSync } from 'node:child_process';

export const SCIPY_PYTHON = '/usr/bin/python3';

export function scipy<T>(snippet: string, data: unknown): T {
  const program = ['import sys, json', 'import numpy as np', 'from scipy import stats', 'data = json.loads(sys.stdin.read())', snippet, 'print(json.dumps(out))'].join('\n');
  const r = spawnSync(SCIPY_PYTHON, ['-c', program], { input: JSON.stringify(data), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`SciPy helper failed: ${r.stderr || r.error?.message}`);
  return JSON.parse(r.stdout) as T;
}
