/**
 * Toe compensation (ISO 6892-1 and ASTM E111 practice for slack at the start of a record): the
 * straight elastic line is extended back to zero stress, the strain origin is moved there, and
 * the points before the modulus window are replaced by that line (the curve starts at 0, 0).
 *
 * In: engineering strain and stress, the strain origin (mm/mm) and the first index of the modulus
 * window. Out: new arrays starting with the origin point; the input is not changed.
 */
export function compensateToe(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, strainOrigin: number, firstIndex: number, to = strain.length): { strain: Float64Array; stressMpa: Float64Array } {
  const n = to - firstIndex + 1;
  const e = new Float64Array(n);
  const s = new Float64Array(n);
  for (let i = firstIndex, k = 1; i < to; i++, k++) { e[k] = strain[i] - strainOrigin; s[k] = stressMpa[i]; }
  return { strain: e, stressMpa: s };
}
