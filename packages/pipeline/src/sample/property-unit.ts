/**
 * Unit of a per-test property key, from its suffix (`_mpa` MPa, `_gpa` GPa, `_pct` %); `1` for the
 * dimensionless ones (n-value, yield/tensile ratio). Units as in the `fractile properties` contract.
 */
export function propertyUnit(key: string): string {
  if (key.endsWith('_mpa')) return 'MPa';
  if (key.endsWith('_gpa')) return 'GPa';
  if (key.endsWith('_pct')) return '%';
  return '1';
}
