/**
 * The per-test reduction: one record (canonical units) to its properties, true curve, grid
 * values and law fits, following ISO 6892-1 (tensile quantities), ASTM E111 (modulus) and
 * ISO 10275 (n-value). Pure: no I/O, no clock. Cost O(points) without the law fits.
 *
 * Order: engineering stress/strain → unload–reload loops cut out → noise, maximum force →
 * discontinuous yielding → modulus (iterated on the first yield) → toe compensation → Rp, Rt,
 * ReH/ReL/Ae, Rm, Ag, Agt (from smooth fits to the top of the curve, smooth-maximum.ts), A →
 * true curve to maximum force → n, K → shape class, slips → grid → law fits (optional).
 *
 * `details` keys (all JSON values): strain_source, points, dropped_points, spikes, noise_mpa,
 * modulus {r2, window_mpa, window_fraction, window_narrowed, points, iterations}, toe_shift_strain, loops
 * [{unloading_modulus_gpa, at_strain}], discontinuous {kind, reh_strain, plateau_end_strain} |
 * null, rp_strain, max_force_strain, max_force_smoothed, fracture_strain, at_pct, points_past_max_force,
 * n {window_pct, reduced, points, r2}, slips, extensometer_removed_at_strain, fits_points.
 *
 * Failures (never a NaN): see FAILURE_CODES in flags.ts.
 */
import { engineeringCurve } from './engineering.ts';
import { findDiscontinuousYield } from './discontinuous-yield.ts';
import type { FlagName } from './flags.ts';
import { hardeningExponent } from './hardening-exponent.ts';
import { fitHollomon, fitRambergOsgood, fitSwift, fitVoce } from './law-fits.ts';
import { fitModulusIterative } from './modulus.ts';
import { noiseSdMpa } from './noise.ts';
import { offsetYield } from './offset-yield.ts';
import { resampleOnGrid } from './grid.ts';
import { MODULUS_RANGE_GPA } from './settings.ts';
import { shapeClass } from './shape-class.ts';
import { countSlips } from './slip.ts';
import { indexOfMax, tensileValues } from './tensile.ts';
import { compensateToe } from './toe.ts';
import { totalExtensionYield } from './total-extension-yield.ts';
import { trueCurve } from './true-curve.ts';
import type { CurveInput, LawFits, ReduceOutcome, ReduceSettings, TestProperties } from './types.ts';
import { findUnloadLoops } from './unload-loops.ts';

/** points handed to the law fits (evenly spaced by index over the fitted range) */
const FIT_POINTS = 80;
const FIT_POINTS_RO = 100;

const fail = (code: string, message: string): ReduceOutcome => ({ ok: false, code, message });
const round = (v: number, digits = 6): number => Number(v.toPrecision(digits));

/** Evenly spaced indices of [from, to] (inclusive), at most `max` of them. */
function decimate(from: number, to: number, max: number): Int32Array {
  const count = to - from + 1;
  if (count <= max) return Int32Array.from({ length: Math.max(0, count) }, (_, k) => from + k);
  return Int32Array.from({ length: max }, (_, k) => from + Math.round((k * (count - 1)) / (max - 1)));
}

/** A message naming the first invalid setting, or null. */
export function checkSettings(st: ReduceSettings): string | null {
  const pos = (v: number) => Number.isFinite(v) && v > 0;
  if (!pos(st.rpOffsetPct)) return `rpOffsetPct must be positive, got ${st.rpOffsetPct}`;
  if (!pos(st.rtTotalPct)) return `rtTotalPct must be positive, got ${st.rtTotalPct}`;
  const [mlo, mhi] = st.modulusWindow;
  if (!(pos(mlo) && pos(mhi) && mlo < mhi && mhi <= 1)) return `modulusWindow must be 0 < lo < hi ≤ 1, got [${mlo}, ${mhi}]`;
  const [nlo, nhi] = st.nWindowPct;
  if (!(pos(nlo) && pos(nhi) && nlo < nhi)) return `nWindowPct must be 0 < lo < hi, got [${nlo}, ${nhi}]`;
  for (let i = 1; i < st.gridPlasticStrain.length; i++) {
    if (!(st.gridPlasticStrain[i] > st.gridPlasticStrain[i - 1])) return 'gridPlasticStrain must be strictly increasing';
  }
  return null;
}

export function reduceCurve(input: CurveInput, settings: ReduceSettings): ReduceOutcome {
  const bad = checkSettings(settings);
  if (bad) return fail('bad_settings', bad);
  const eng = engineeringCurve(input);
  if (!eng.ok) return fail(eng.code, eng.message);
  const flags = new Set<FlagName>();
  const removed = eng.curve.extensometerRemovedAt >= 0;
  if (removed) flags.add('extensometer_removed_early');
  if (eng.curve.spikes > 0) flags.add('spikes_removed');

  const env = findUnloadLoops(eng.curve.strain, eng.curve.stressMpa);
  if (env.loops.length > 0) flags.add('unload_reload');
  const rawStrain = env.strain, rawStress = env.stressMpa;
  const nRaw = rawStrain.length;
  const imaxRaw = indexOfMax(rawStress);
  if (imaxRaw < 5) return fail('too_short', 'maximum force within the first points of the record');
  const rmRecorded = rawStress[imaxRaw];
  if (!(rmRecorded > 0)) return fail('no_maximum', 'no positive force in the record');
  const noise = noiseSdMpa(rawStress, 0, imaxRaw + 1);
  if (!removed) {
    // a maximum needs a fall after it that the noise cannot explain
    let after = Infinity;
    for (let i = imaxRaw + 1; i < nRaw; i++) if (rawStress[i] < after) after = rawStress[i];
    if (!(after < rmRecorded - Math.max(4 * noise, 1e-3 * rmRecorded))) return fail('no_maximum', 'the record ends while the force still rises: maximum force not reached');
  }
  const maxAfterRemoval = removed && eng.curve.fullRecordMaxStressMpa > rmRecorded;
  const rmScreen = removed ? Math.max(rmRecorded, eng.curve.fullRecordMaxStressMpa) : rmRecorded;

  if (noise > 0.03 * rmScreen) return fail('too_noisy', `stress noise ${noise.toFixed(2)} MPa is above 3 % of Rm (${rmScreen.toFixed(1)} MPa)`);
  if (noise > 0.005 * rmScreen) flags.add('noisy');

  const dyRaw = findDiscontinuousYield(rawStrain, rawStress, imaxRaw, noise);
  const rpOffset = settings.rpOffsetPct / 100;
  const mod = fitModulusIterative(rawStrain, rawStress, imaxRaw + 1, rmRecorded, settings.modulusWindow,
    (eMpa, origin) => (dyRaw ? dyRaw.rehMpa : offsetYield(rawStrain, rawStress, eMpa, origin, rpOffset, 0, imaxRaw + 1)?.stressMpa ?? null));
  if (!mod) return fail('no_elastic_part', 'no straight rising part in the modulus window (fewer than 3 points or a non-positive slope)');
  const E = mod.eMpa;
  const crosshead = eng.curve.strainSource === 'crosshead';
  if (mod.r2 < 0.995 || mod.points < 8) flags.add('modulus_poor_fit');
  if (crosshead) flags.add('crosshead_only_modulus');
  else {
    const range = MODULUS_RANGE_GPA[settings.family];
    if (range && (E / 1000 < range[0] || E / 1000 > range[1])) flags.add('modulus_implausible');
  }

  // toe compensation: from here on the strain origin is where the elastic line meets zero stress
  const shift = mod.fromIndex - 1; // compensated index = raw index − shift
  const { strain: e, stressMpa: s } = compensateToe(rawStrain, rawStress, mod.strainOrigin, mod.fromIndex);
  const n = e.length;
  const t = tensileValues(e, s, noise);
  const imax = t.maxIndex;
  // Rm: the smoothed maximum of the extensometer record; where the force rose further after the
  // extensometer came off, the largest force of the whole record (no smoothing across the removal)
  const rmMpa = maxAfterRemoval ? eng.curve.fullRecordMaxStressMpa : t.rmMpa;
  if (imax < 3) return fail('too_short', 'no points between the elastic window and maximum force');
  const fracEnd = removed ? n - 1 : t.fractureIndex;

  const rp = offsetYield(e, s, E, 0, rpOffset, 0, fracEnd + 1);
  if (!rp) flags.add('rp_not_reached');
  const rt = totalExtensionYield(e, s, 0, settings.rtTotalPct / 100, 0, fracEnd + 1);
  if (!rt) flags.add('rt_not_reached');
  const dy = dyRaw ? { ...dyRaw, rehIndex: dyRaw.rehIndex - shift, relIndex: dyRaw.relIndex - shift, plateauEndIndex: dyRaw.plateauEndIndex - shift } : null;
  const dyValid = dy !== null && dy.rehIndex > 0 && dy.plateauEndIndex < n;

  const agtPct = maxAfterRemoval ? null : 100 * t.uniformStrain;
  const agPct = maxAfterRemoval ? null : 100 * (t.uniformStrain - rmMpa / E);
  if (!removed && !t.fractureDetected) flags.add('fracture_not_detected');
  const aPct = removed ? null : 100 * (t.fractureStrain - t.fractureStressMpa / E);
  const atPct = removed ? null : 100 * t.fractureStrain;

  const tc = trueCurve(e, s, E, imax);
  const pastMax = fracEnd - imax;
  if (pastMax > 0) flags.add('past_max_force_ignored');

  const ypeEndStrain = dyValid ? dy.plateauEndStrain - mod.strainOrigin : 0;
  const agForN = agPct ?? 100 * (e[imax] - s[imax] / E);
  const nv = hardeningExponent(e, tc.trueStrain, tc.trueStressMpa, settings.nWindowPct, agForN, ypeEndStrain);
  if (nv.reduced) flags.add('n_window_reduced');
  if (nv.n === null) flags.add('n_window_short');

  const onset = offsetYield(e, s, E, 0, 1e-4, 0, imax + 1);
  const plasticFrom = rp && rp.index <= imax ? rp.index : onset ? onset.index : -1;
  const shape = shapeClass(e, s, plasticFrom, imax, E, rmMpa, dyValid);
  // the yield-point range counts from the onset of plastic flow (a first peak lower than later
  // serrations is still part of yielding, not a slip)
  const ypFrom = dyValid ? Math.min(dy.rehIndex, onset ? onset.index : dy.rehIndex) : -1;
  const slips = countSlips(e, s, imax, noise, rmMpa, ypFrom, dyValid ? dy.plateauEndIndex : -1);
  if (slips > 0) flags.add('slipping');

  // Crosshead travel is referred to the parallel length and carries the machine's compliance, not
  // the extension over L0 (ISO 6892-1 asks for an extensometer for these): elongations, Rt, the
  // yield-point extension and the true curve on the grid are not given for such a record.
  const strainValid = !crosshead;
  if (crosshead) flags.add('elongation_from_crosshead');
  const grid = onset && strainValid
    ? resampleOnGrid(tc.plasticStrain, tc.trueStressMpa, onset.index, onset.stressMpa * (1 + onset.strain), settings.gridPlasticStrain)
    : settings.gridPlasticStrain.map(() => null);

  let fits: LawFits | null = null;
  let fitsPoints = 0;
  if (settings.fitLaws) {
    let from = dyValid ? dy.plateauEndIndex : plasticFrom;
    if (from < 0) from = imax;
    const idx = decimate(from, imax, FIT_POINTS);
    const et = new Float64Array(idx.length), ep = new Float64Array(idx.length), st = new Float64Array(idx.length);
    for (let k = 0; k < idx.length; k++) { et[k] = tc.trueStrain[idx[k]]; ep[k] = tc.plasticStrain[idx[k]]; st[k] = tc.trueStressMpa[idx[k]]; }
    const ro = decimate(0, imax, FIT_POINTS_RO);
    const re = new Float64Array(ro.length), rs = new Float64Array(ro.length);
    for (let k = 0; k < ro.length; k++) { re[k] = e[ro[k]]; rs[k] = s[ro[k]]; }
    fitsPoints = idx.length;
    fits = { hollomon: fitHollomon(et, st), swift: fitSwift(ep, st), voce: fitVoce(ep, st), ramberg_osgood: fitRambergOsgood(re, rs, E) };
  }

  const rehMpa = dyValid ? dy.rehMpa : null;
  const relMpa = dyValid ? dy.relMpa : null;
  let yieldMpa: number | null;
  switch (settings.yieldDefinition) {
    case 'rp0.2': yieldMpa = rp ? rp.stressMpa : null; break;
    case 'rt0.5': yieldMpa = rt && strainValid ? rt.stressMpa : null; break;
    case 'reh': yieldMpa = rehMpa; break;
    case 'rel': yieldMpa = relMpa; break;
  }
  if ((settings.yieldDefinition === 'reh' || settings.yieldDefinition === 'rel') && !dyValid) flags.add('yield_definition_not_applicable');

  const properties: TestProperties = {
    modulus_gpa: E / 1000,
    rp02_mpa: rp ? rp.stressMpa : null,
    rt05_mpa: rt && strainValid ? rt.stressMpa : null,
    reh_mpa: rehMpa,
    rel_mpa: relMpa,
    ype_pct: dyValid && strainValid ? 100 * dy.ypeStrain : null,
    rm_mpa: rmMpa,
    ag_pct: strainValid ? agPct : null,
    agt_pct: strainValid ? agtPct : null,
    a_pct: strainValid ? aPct : null,
    yt_ratio: yieldMpa !== null ? yieldMpa / rmMpa : null,
    n_value: nv.n,
    k_mpa: nv.kMpa,
    yield_mpa: yieldMpa,
    yield_definition: settings.yieldDefinition,
    shape_class: shape,
    flags: [...flags],
  };
  const details: Record<string, unknown> = {
    strain_source: eng.curve.strainSource,
    points: n,
    dropped_points: eng.curve.droppedPoints,
    spikes: eng.curve.spikes,
    noise_mpa: round(noise),
    modulus: { r2: round(mod.r2, 8), window_mpa: [round(mod.windowMpa[0]), round(mod.windowMpa[1])], window_fraction: mod.windowFractions, window_narrowed: mod.windowFractions[0] !== settings.modulusWindow[0] || mod.windowFractions[1] !== settings.modulusWindow[1], points: mod.points, iterations: mod.iterations },
    toe_shift_strain: round(mod.strainOrigin),
    loops: env.loops.map((l) => ({ unloading_modulus_gpa: l.unloadingModulusMpa !== null ? round(l.unloadingModulusMpa / 1000) : null, at_strain: round(l.atStrain - mod.strainOrigin) })),
    discontinuous: dyValid ? { kind: dy.kind, reh_strain: round(e[dy.rehIndex]), plateau_end_strain: round(ypeEndStrain) } : null,
    rp_strain: rp ? round(rp.strain) : null,
    max_force_strain: round(t.uniformStrain),
    max_force_smoothed: t.smoothedMaximum,
    fracture_strain: removed ? null : round(t.fractureStrain),
    at_pct: atPct,
    points_past_max_force: pastMax,
    n: { window_pct: nv.windowPct, reduced: nv.reduced, points: nv.points, r2: nv.r2 },
    slips,
    extensometer_removed_at_strain: removed ? round(e[n - 1]) : null,
    fits_points: fitsPoints,
  };
  return { ok: true, result: { properties, details, trueCurve: tc, grid, fits } };
}
