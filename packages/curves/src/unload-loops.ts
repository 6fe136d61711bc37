/**
 * Unload–reload loops: the stress falls by at least 15 % of its value at the loop start (and by
 * at least 5 % of the record's maximum, so that noise at the start is no loop) while
 * the strain goes back (by at least a quarter of the elastic return at 250 GPa), and later
 * reloads to the loop-start stress. The unloading modulus of each loop is the least-squares slope
 * of its unloading branch between 10 % and 90 % of the branch's stress range (the fact that
 * unloading follows the initial elastic slope is common practice). The loops are then cut out of
 * the curve: the monotonic envelope keeps the loop start and continues at the reloading point.
 *
 * In: engineering strain (mm/mm), stress (MPa). Out: loops (indices into the input) and the
 * envelope (the input arrays themselves when there is no loop). A fall with no reload (fracture,
 * end of test) is not a loop.
 */
import { fitLine } from './line-fit.ts';

export interface UnloadLoop {
  startIndex: number;
  minIndex: number;
  reloadIndex: number;
  unloadingModulusMpa: number | null;
  atStrain: number;
}

export interface Envelope {
  strain: Float64Array;
  stressMpa: Float64Array;
  loops: UnloadLoop[];
}

const E_UPPER_MPA = 250_000;

export function findUnloadLoops(strain: Float64Array, stressMpa: Float64Array): Envelope {
  const n = strain.length;
  const loops: UnloadLoop[] = [];
  let top = 0;
  for (let k = 0; k < n; k++) if (stressMpa[k] > top) top = stressMpa[k];
  const minDrop = 0.05 * top;
  let p = 0;
  let i = 1;
  while (i < n) {
    if (stressMpa[i] >= stressMpa[p]) { p = i; i++; continue; }
    const sp = stressMpa[p];
    const drop = sp - stressMpa[i];
    if (sp > 0 && drop >= 0.15 * sp && drop >= minDrop && strain[i] < strain[p] - (0.25 * drop) / E_UPPER_MPA) {
      // follow the unloading branch to its minimum
      let m = i;
      let j = i + 1;
      while (j < n && stressMpa[j] < sp) {
        if (stressMpa[j] < stressMpa[m]) m = j;
        // the reload has started once the stress is clearly above the minimum and the strain rises
        j++;
      }
      if (j >= n) break; // no reload: fracture or end of record
      const lo = stressMpa[m] + 0.1 * (sp - stressMpa[m]);
      const hi = sp - 0.1 * (sp - stressMpa[m]);
      let fit = fitLine(strain, stressMpa, p, m + 1, (k) => stressMpa[k] >= lo && stressMpa[k] <= hi);
      if (!fit || fit.points < 3) fit = fitLine(strain, stressMpa, p, m + 1);
      loops.push({ startIndex: p, minIndex: m, reloadIndex: j, unloadingModulusMpa: fit && fit.slope > 0 ? fit.slope : null, atStrain: strain[p] });
      p = j;
      i = j + 1;
      continue;
    }
    i++;
  }
  if (loops.length === 0) return { strain, stressMpa, loops };
  let keep = n;
  for (const l of loops) keep -= l.reloadIndex - l.startIndex - 1;
  const es = new Float64Array(keep);
  const ss = new Float64Array(keep);
  let k = 0, li = 0;
  for (let q = 0; q < n; q++) {
    const l = loops[li];
    if (l && q > l.startIndex && q < l.reloadIndex) continue;
    if (l && q === l.reloadIndex) li++;
    es[k] = strain[q]; ss[k] = stressMpa[q]; k++;
  }
  return { strain: es, stressMpa: ss, loops };
}
