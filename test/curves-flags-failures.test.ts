/**
 * Failures with their reasons (never a silent NaN) and the curve flags: unload–reload loops
 * (unloading follows the initial elastic slope — REFERENCES.md, facts of the trade, common
 * practice), extensometer removed early, slipping, noise, crosshead.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, FAILURE_CODES, FLAGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve, plateauCurve, rambergOsgoodCurve } from '@fractile/curves/testing';

const S = DEFAULT_REDUCE_SETTINGS;

describe('failures', () => {
  it('no channels, missing geometry, mismatched channels, too short', () => {
    expect(reduceCurve({}, S)).toMatchObject({ ok: false, code: 'no_channels' });
    expect(reduceCurve({ forceN: Float64Array.of(1, 2, 3), areaMm2: 10 }, S)).toMatchObject({ ok: false, code: 'no_channels' });
    expect(reduceCurve({ forceN: Float64Array.of(1, 2, 3), extensionMm: Float64Array.of(0, 1, 2), gaugeLengthMm: 50 }, S)).toMatchObject({ ok: false, code: 'missing_geometry' });
    const syn = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12 });
    expect(reduceCurve({ ...syn.input, areaMm2: null }, S)).toMatchObject({ ok: false, code: 'missing_geometry' });
    expect(reduceCurve({ ...syn.input, gaugeLengthMm: 0 }, S)).toMatchObject({ ok: false, code: 'missing_geometry' });
    expect(reduceCurve({ ...syn.input, extensionMm: syn.input.extensionMm!.subarray(1) }, S)).toMatchObject({ ok: false, code: 'channel_length_mismatch' });
    expect(reduceCurve({ ...syn.input, forceN: syn.input.forceN!.subarray(0, 12), extensionMm: syn.input.extensionMm!.subarray(0, 12) }, S)).toMatchObject({ ok: false, code: 'too_short' });
  });

  it('no maximum: the record stops while the force still rises', () => {
    const syn = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12 });
    const n = 1200; // well before maximum force
    const r = reduceCurve({ ...syn.input, forceN: syn.input.forceN!.subarray(0, n), extensionMm: syn.input.extensionMm!.subarray(0, n) }, S);
    expect(r).toMatchObject({ ok: false, code: 'no_maximum' });
    // with noise the last point need not be the highest: still no maximum
    const noisy = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12, noiseMpa: 1, seed: 5 });
    const r2 = reduceCurve({ ...noisy.input, forceN: noisy.input.forceN!.subarray(0, n), extensionMm: noisy.input.extensionMm!.subarray(0, n) }, S);
    expect(r2).toMatchObject({ ok: false, code: 'no_maximum' });
  });

  it('no elastic part: the record starts in the plastic range', () => {
    const syn = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12 });
    const from = 900;
    const r = reduceCurve({ ...syn.input, forceN: syn.input.forceN!.subarray(from), extensionMm: syn.input.extensionMm!.subarray(from) }, S);
    expect(r).toMatchObject({ ok: false, code: 'no_elastic_part' });
  });

  it('too noisy: noise above 3 % of Rm', () => {
    const syn = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12, noiseMpa: 25, seed: 2 });
    expect(reduceCurve(syn.input, S)).toMatchObject({ ok: false, code: 'too_noisy' });
    const mild = reduceCurve(rambergOsgoodCurve({ sigma0Mpa: 350, m: 12, noiseMpa: 4, seed: 2 }).input, S);
    expect(mild.ok && mild.result.properties.flags.includes('noisy')).toBe(true);
    const clean = reduceCurve(rambergOsgoodCurve({ sigma0Mpa: 350, m: 12, noiseMpa: 0.5, seed: 2 }).input, S);
    expect(clean.ok && clean.result.properties.flags.includes('noisy')).toBe(false);
  });

  it('invalid settings are a failure, not a guess', () => {
    const syn = rambergOsgoodCurve({ sigma0Mpa: 350, m: 12 });
    expect(reduceCurve(syn.input, { ...S, modulusWindow: [0.4, 0.1] })).toMatchObject({ ok: false, code: 'bad_settings' });
    expect(reduceCurve(syn.input, { ...S, rpOffsetPct: 0 })).toMatchObject({ ok: false, code: 'bad_settings' });
    expect(reduceCurve(syn.input, { ...S, gridPlasticStrain: [0, 0.02, 0.01] })).toMatchObject({ ok: false, code: 'bad_settings' });
  });

  it('every failure code and flag used is documented', () => {
    for (const code of ['bad_settings', 'no_channels', 'missing_geometry', 'channel_length_mismatch', 'too_short', 'no_elastic_part', 'no_maximum', 'too_noisy']) expect(FAILURE_CODES).toHaveProperty(code);
    for (const f of ['noisy', 'slipping', 'extensometer_removed_early', 'unload_reload', 'crosshead_only_modulus', 'modulus_implausible', 'modulus_poor_fit', 'past_max_force_ignored', 'n_window_reduced', 'given']) expect(FLAGS).toHaveProperty(f);
  });
});

describe('flags', () => {
  it('unload–reload loops: found, cut out, their unloading modulus equals E; properties unchanged', () => {
    const plain = hollomonCurve({ kMpa: 800, n: 0.2, points: 2100 });
    const looped = hollomonCurve({ kMpa: 800, n: 0.2, points: 2100 + 80, loopsAt: [0.03, 0.1] });
    const a = reduceCurve(plain.input, S), b = reduceCurve(looped.input, S);
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    expect(b.result.properties.flags).toContain('unload_reload');
    expect(a.result.properties.flags).not.toContain('unload_reload');
    const loops = b.result.details.loops as { unloading_modulus_gpa: number; at_strain: number }[];
    expect(loops).toHaveLength(2);
    for (const l of loops) expect(l.unloading_modulus_gpa).toBeCloseTo(205, 3);
    expect(loops[0].at_strain).toBeCloseTo(0.03, 3);
    expect(loops[1].at_strain).toBeCloseTo(0.1, 3);
    // the monotonic envelope gives the same values as the record without loops
    expect(b.result.properties.rm_mpa!).toBeCloseTo(a.result.properties.rm_mpa!, 6);
    expect(b.result.properties.rp02_mpa!).toBeCloseTo(a.result.properties.rp02_mpa!, 6);
    expect(b.result.properties.n_value!).toBeCloseTo(a.result.properties.n_value!, 4);
    // the true curve is monotone in strain (no loop inside)
    const t = b.result.trueCurve.trueStrain;
    for (let i = 1; i < t.length; i++) expect(t[i]).toBeGreaterThanOrEqual(t[i - 1]);
  });

  it('extensometer removed before fracture (blank or frozen channel): A not given, Rm from the whole force record', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2 });
    const ext = syn.input.extensionMm!;
    const full = reduceCurve(syn.input, S);
    expect(full.ok).toBe(true);
    if (!full.ok) return;
    // removal after maximum force: Ag, Agt still measured
    const cut = 1750;
    const blank = ext.map((x, i) => (i >= cut ? NaN : x));
    const frozen = ext.map((x, i) => (i >= cut ? ext[cut] : x));
    for (const e of [blank, frozen]) {
      const r = reduceCurve({ ...syn.input, extensionMm: e }, S);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const p = r.result.properties;
      expect(p.flags).toContain('extensometer_removed_early');
      expect(p.a_pct).toBeNull();
      expect(p.rm_mpa!).toBeCloseTo(full.result.properties.rm_mpa!, 9);
      expect(p.agt_pct!).toBeCloseTo(full.result.properties.agt_pct!, 9);
    }
    // removal before maximum force: Rm still from the force channel; Ag, Agt not given
    const early = ext.map((x, i) => (i >= 1000 ? NaN : x));
    const r = reduceCurve({ ...syn.input, extensionMm: early }, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.result.properties.rm_mpa!).toBeCloseTo(full.result.properties.rm_mpa!, 9);
    expect(r.result.properties.agt_pct).toBeNull();
    expect(r.result.properties.ag_pct).toBeNull();
    expect(r.result.properties.rp02_mpa!).toBeCloseTo(full.result.properties.rp02_mpa!, 9);
    // a channel that freezes only after the fracture drop is not a removal
    const late = ext.map((x, i) => (i >= ext.length - 1 ? ext[ext.length - 2] : x));
    const r2 = reduceCurve({ ...syn.input, extensionMm: late }, S);
    expect(r2.ok && r2.result.properties.flags.includes('extensometer_removed_early')).toBe(false);
  });

  it('slipping: a sudden force drop and recovery in the hardening range is flagged', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2, noiseMpa: 0.5, seed: 4 });
    const f = syn.input.forceN!.slice();
    const k = 600; // in the hardening range, strain ≈ 4 %
    for (let i = k; i < k + 3; i++) f[i] -= 20 * syn.input.areaMm2!;
    const r = reduceCurve({ ...syn.input, forceN: f }, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.result.properties.flags).toContain('slipping');
    expect(r.result.properties.shape_class).toBe('continuous');
    const clean = reduceCurve(syn.input, S);
    expect(clean.ok && clean.result.properties.flags.includes('slipping')).toBe(false);
  });

  it('isolated glitches in either channel are left out and flagged; the properties do not move', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2, noiseMpa: 0.5, seed: 6 });
    const clean = reduceCurve(syn.input, S);
    const f = syn.input.forceN!.slice(), x = syn.input.extensionMm!.slice();
    f[700] = 1e9; x[1200] = -1e6; f[150] = -5e4;
    const r = reduceCurve({ ...syn.input, forceN: f, extensionMm: x }, S);
    expect(clean.ok && r.ok).toBe(true);
    if (!clean.ok || !r.ok) return;
    expect(r.result.properties.flags).toContain('spikes_removed');
    expect(r.result.details.spikes).toBe(3);
    for (const k of ['rm_mpa', 'rp02_mpa', 'agt_pct', 'n_value', 'modulus_gpa'] as const) {
      expect(Math.abs(r.result.properties[k]! - clean.result.properties[k]!) / Math.abs(clean.result.properties[k]!), k).toBeLessThan(2e-3);
    }
    // the upper yield drop and the fracture drop are steps, not glitches
    const p = reduceCurve(plateauCurve({ rehMpa: 345, relMpa: 300, ypeStrain: 0.02, points: 500 }).input, S);
    expect(p.ok && p.result.details.spikes).toBe(0);
  });

  it('fracture: A from the curve is the plastic extension at fracture, At the total', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.result.properties;
    // ISO 6892-1: A = e_f − σ_f/E at the last point before the force falls away
    // the generator's last point before the two-sample drop
    const ef = syn.exact.fracture_strain, sf = syn.stressMpa[syn.stressMpa.length - 3];
    expect(r.result.details.at_pct as number).toBeCloseTo(100 * ef, 3);
    expect(p.a_pct!).toBeCloseTo(100 * (ef - sf / (p.modulus_gpa! * 1000)), 3);
    expect(p.flags).not.toContain('fracture_not_detected');
  });
});
