/**
 * Runs a Python snippet with the system interpreter that carries SciPy (Debian's python3-scipy;
 * the `python3` on PATH may lack it). The snippet reads one JSON document from stdin as `data`
 * and must print one JSON document on stdout. Used by checks that compare our numbers with SciPy.
 */
import { spawnSync } from 'node:child_process';

export const SCIPY_PYTHON = '/usr/bin/python3';

export class PythonError extends Error {
  constructor(message: string, readonly stderr: string) { super(message); }
}

/** Runs `code` with `data` bound to the parsed `input`; returns the parsed stdout. */
export function runPython<T = unknown>(code: string, input: unknown, timeoutMs = 300_000): T {
  const prelude = 'import json, sys\ndata = json.load(sys.stdin)\n';
  const r = spawnSync(SCIPY_PYTHON, ['-c', prelude + code], { input: JSON.stringify(input), encoding: 'utf8', timeout: timeoutMs, maxBuffer: 256 * 1024 * 1024 });
  if (r.error) throw new PythonError(`cannot run ${SCIPY_PYTHON}: ${r.error.message}`, '');
  if (r.status !== 0) throw new PythonError(`python exited with ${r.status}: ${r.stderr.slice(-2000)}`, r.stderr);
  try {
    return JSON.parse(r.stdout) as T;
  } catch {
    throw new PythonError(`python printed no JSON: ${r.stdout.slice(0, 500)}`, r.stderr);
  }
}

/** SciPy's version string, or null when it cannot be imported. */
export function scipyVersion(): string | null {
  const r = spawnSync(SCIPY_PYTHON, ['-c', 'import scipy; print(scipy.__version__)'], { encoding: 'utf8' });
  return r.status === 0 ? r.stdout.trim() : null;
}

/** `runPython` with NumPy as `np` and `scipy.stats` as `stats` imported; `input` arrives as `data`. */
export function scipy<T>(code: string, input: unknown = null): T {
  return runPython<T>(`import numpy as np\nfrom scipy import stats\n${code}`, input);
}
