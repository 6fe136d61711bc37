/**
 * The side panel of a group's curves: the idealizations of the characteristic curve in the
 * trade's words and units (modulus of elasticity E, yield stress, hardening modulus against true
 * plastic strain and tangent modulus against total strain, Ramberg–Osgood σ0 and exponent m, the
 * multilinear points as a small table), and the curve's provenance as labelled lines (number of
 * tests, settings hash, code version, date). Stresses and moduli in MPa; strains dimensionless.
 */
import { formatInteger, formatShort } from './format-number.ts';
import { escapeHtml } from './html-escape.ts';
import { htmlTable } from './html-table.ts';
import type { CharacteristicCurve, IdealizedCurves } from './types.ts';

const mpa = (v: number | null | undefined, digits = 4) => (v === null || v === undefined ? '–' : `${formatShort(v, digits)} MPa`);

function lines(items: readonly (readonly [string, string])[]): string {
  return `<dl class="kv">${items.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>`).join('')}</dl>`;
}

function idealizedHtml(ideal: IdealizedCurves): string {
  const epp = ideal.elastic_perfectly_plastic;
  const bi = ideal.bilinear;
  const ro = ideal.ramberg_osgood;
  const parts = [
    '<h4>Elastic–perfectly plastic</h4>',
    lines([
      ['Modulus of elasticity E', mpa(epp.e_mpa, 5)],
      ['Yield stress', mpa(epp.yield_mpa)],
    ]),
    '<h4>Bilinear (linear hardening)</h4>',
    lines([
      ['Yield stress', mpa(bi.yield_mpa)],
      ['Hardening modulus (vs true plastic strain)', mpa(bi.hardening_modulus_mpa)],
      ['Tangent modulus (vs total strain)', mpa(bi.tangent_modulus_mpa)],
      ['RMS deviation from the curve', mpa(bi.rmse_mpa, 3)],
    ]),
  ];
  if (ro) {
    parts.push(
      '<h4>Ramberg–Osgood, ε = σ/E + 0.002·(σ/σ0)<sup>m</sup></h4>',
      lines([
        ['Proof stress σ0', mpa(ro.sigma0_mpa)],
        ['Exponent m', formatShort(ro.m, 4)],
        ['RMS deviation from the curve', mpa(ro.rmse_mpa, 3)],
      ]),
    );
  }
  const ml = ideal.multilinear;
  if (ml.plastic_strain.length > 0) {
    parts.push(
      '<h4>Multilinear points</h4>',
      htmlTable(
        [
          { header: 'True plastic strain', note: '[–]', numeric: true },
          { header: 'True stress', note: '[MPa]', numeric: true },
          { header: '' },
        ],
        ml.plastic_strain.map((x, i) => [formatShort(x, 4), formatShort(ml.stress_mpa[i], 4), ml.extrapolated[i] ? 'extrapolated' : '']),
        { className: 'data compact' },
      ),
    );
  }
  return parts.join('\n');
}

function provenanceHtml(curve: CharacteristicCurve): string {
  const p = curve.provenance;
  if (!p) return '<p class="empty">Not recorded.</p>';
  const settings = Object.entries(p.settings)
    .map(([k, v]) => `${k.replace(/_/g, ' ')} ${typeof v === 'number' ? formatShort(v, 6) : String(v)}`)
    .join(' · ');
  return lines([
    ['Tests', formatInteger(p.n_tests)],
    ['Settings', settings || '–'],
    ['Settings hash', p.settings_hash],
    ['Test list SHA-256', p.test_ids_sha256.slice(0, 16) + '…'],
    ['Code version', p.code_version],
    ['Computed', p.generated_at],
  ]);
}

/** The panel beside the curves chart. */
export function idealizedPanel(curve: CharacteristicCurve): string {
  const ideal = curve.idealized ? idealizedHtml(curve.idealized) : '<p class="empty">No idealization (the curve has no valid range).</p>';
  return `<h3>Idealized characteristic curve</h3>
${ideal}
<details class="provenance"><summary>Provenance</summary>
${provenanceHtml(curve)}
</details>`;
}
