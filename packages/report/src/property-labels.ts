/**
 * Display names, units and table precision of the per-test property keys
 * (`fractile properties` contract). Symbols follow ISO 6892-1 (Rp, Rt, ReH, ReL, Rm, Ag, Agt, A)
 * and ISO 10275 (n-value).
 */
export interface PropertyLabel {
  name: string;
  unit: string;
  /** Decimals shown in tables for values of this property. */
  decimals: number;
}

const LABELS: Readonly<Record<string, PropertyLabel>> = {
  modulus_gpa: { name: 'modulus E', unit: 'GPa', decimals: 1 },
  rp02_mpa: { name: 'Rp0.2', unit: 'MPa', decimals: 1 },
  rt05_mpa: { name: 'Rt0.5', unit: 'MPa', decimals: 1 },
  reh_mpa: { name: 'ReH', unit: 'MPa', decimals: 1 },
  rel_mpa: { name: 'ReL', unit: 'MPa', decimals: 1 },
  ype_pct: { name: 'yield-point extension', unit: '%', decimals: 2 },
  rm_mpa: { name: 'Rm', unit: 'MPa', decimals: 1 },
  ag_pct: { name: 'Ag', unit: '%', decimals: 2 },
  agt_pct: { name: 'Agt', unit: '%', decimals: 2 },
  a_pct: { name: 'A', unit: '%', decimals: 1 },
  yt_ratio: { name: 'yield/tensile ratio', unit: '–', decimals: 3 },
  n_value: { name: 'n-value', unit: '–', decimals: 3 },
  k_mpa: { name: 'K', unit: 'MPa', decimals: 1 },
  yield_mpa: { name: 'yield', unit: 'MPa', decimals: 1 },
};

/** Label of a property key; unknown keys fall back to their unit suffix (`_mpa`, `_pct`, `_gpa`). */
export function propertyLabel(property: string): PropertyLabel {
  const known = LABELS[property];
  if (known) return known;
  const suffix = /_(mpa|pct|gpa|mm)$/.exec(property);
  const unit = suffix ? { mpa: 'MPa', pct: '%', gpa: 'GPa', mm: 'mm' }[suffix[1] as 'mpa' | 'pct' | 'gpa' | 'mm'] : '–';
  const name = suffix ? property.slice(0, -suffix[0].length) : property;
  return { name: name.replace(/_/g, ' '), unit, decimals: unit === '–' ? 3 : 2 };
}

/** Axis title with unit, e.g. "Rp0.2 [MPa]". */
export function propertyAxisTitle(property: string): string {
  const label = propertyLabel(property);
  return `${label.name} [${label.unit}]`;
}
