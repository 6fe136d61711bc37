/**
 * JSON export of design curves (the `fractile curves --format json` contract: an array of curve
 * objects, each stating its band kind, `pointwise` or `simultaneous`) and its reader. The reader checks the shape key by key and returns the first fault
 * as an error value naming its JSON path; numbers are plain JSON doubles, so a round trip gives
 * back the same values.
 */
import type { DesignCurve, DesignError, DesignResult } from './types.ts';

export function designCurveToJson(curve: DesignCurve): string {
  return JSON.stringify(curve, null, 2);
}

export function designCurvesToJson(curves: readonly DesignCurve[]): string {
  return JSON.stringify(curves, null, 2);
}

class ShapeError extends Error {
  constructor(
    readonly path: string,
    message: string,
  ) {
    super(message);
  }
}

type Obj = Record<string, unknown>;

function obj(v: unknown, path: string): Obj {
  if (!v || typeof v !== 'object' || Array.isArray(v)) throw new ShapeError(path, 'must be an object');
  return v as Obj;
}
function num(v: unknown, path: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) throw new ShapeError(path, 'must be a finite number');
  return v;
}
function numOrNull(v: unknown, path: string): number | null {
  return v === null ? null : num(v, path);
}
function str(v: unknown, path: string): string {
  if (typeof v !== 'string') throw new ShapeError(path, 'must be a string');
  return v;
}
function arr<T>(v: unknown, path: string, item: (x: unknown, p: string) => T, length?: number): T[] {
  if (!Array.isArray(v)) throw new ShapeError(path, 'must be an array');
  if (length !== undefined && v.length !== length) throw new ShapeError(path, `must have ${length} entries, has ${v.length}`);
  return v.map((x, i) => item(x, `${path}[${i}]`));
}
function bool(v: unknown, path: string): boolean {
  if (typeof v !== 'boolean') throw new ShapeError(path, 'must be true or false');
  return v;
}
function strRecord(v: unknown, path: string): Record<string, string> {
  const o = obj(v, path);
  for (const [k, x] of Object.entries(o)) str(x, `${path}.${k}`);
  return o as Record<string, string>;
}

function checkCurve(v: unknown, path: string): DesignCurve {
  const o = obj(v, path);
  strRecord(o.group, `${path}.group`);
  num(o.n, `${path}.n`);
  const x = arr(o.plastic_strain, `${path}.plastic_strain`, num);
  const len = x.length;
  arr(o.median_mpa, `${path}.median_mpa`, num, len);
  arr(o.characteristic_mpa, `${path}.characteristic_mpa`, num, len);
  arr(o.n_at_point, `${path}.n_at_point`, num, len);
  arr(o.extrapolated, `${path}.extrapolated`, bool, len);
  // documents written before the band was stated are pointwise (the only kind there was)
  if (o.band === undefined) Object.assign(o, { band: 'pointwise', band_statement: '', simultaneous: null });
  if (o.band !== 'pointwise' && o.band !== 'simultaneous') throw new ShapeError(`${path}.band`, 'must be pointwise or simultaneous');
  str(o.band_statement, `${path}.band_statement`);
  if (o.simultaneous !== null) {
    const b = obj(o.simultaneous, `${path}.simultaneous`);
    for (const k of ['critical_value', 'max_pointwise_factor', 'simulations', 'components', 'seed']) num(b[k], `${path}.simultaneous.${k}`);
  }
  numOrNull(o.valid_to_plastic_strain, `${path}.valid_to_plastic_strain`);
  numOrNull(o.characteristic_uniform_plastic_strain, `${path}.characteristic_uniform_plastic_strain`);
  numOrNull(o.extrapolated_from, `${path}.extrapolated_from`);
  numOrNull(o.e_mpa, `${path}.e_mpa`);
  numOrNull(o.characteristic_yield_mpa, `${path}.characteristic_yield_mpa`);
  numOrNull(o.median_yield_mpa, `${path}.median_yield_mpa`);
  if (o.extrapolation !== null) {
    const e = obj(o.extrapolation, `${path}.extrapolation`);
    str(e.law, `${path}.extrapolation.law`);
    num(e.fit_from_plastic_strain, `${path}.extrapolation.fit_from_plastic_strain`);
    obj(e.params_characteristic, `${path}.extrapolation.params_characteristic`);
    obj(e.params_median, `${path}.extrapolation.params_median`);
    num(e.rmse_mpa, `${path}.extrapolation.rmse_mpa`);
  }
  if (o.engineering !== null) {
    const e = obj(o.engineering, `${path}.engineering`);
    for (const k of ['median', 'characteristic']) {
      const c = obj(e[k], `${path}.engineering.${k}`);
      arr(c.strain, `${path}.engineering.${k}.strain`, num, len);
      arr(c.stress_mpa, `${path}.engineering.${k}.stress_mpa`, num, len);
    }
  }
  if (o.idealized !== null) {
    const p = `${path}.idealized`;
    const id = obj(o.idealized, p);
    const epp = obj(id.elastic_perfectly_plastic, `${p}.elastic_perfectly_plastic`);
    numOrNull(epp.e_mpa, `${p}.elastic_perfectly_plastic.e_mpa`);
    num(epp.yield_mpa, `${p}.elastic_perfectly_plastic.yield_mpa`);
    const bl = obj(id.bilinear, `${p}.bilinear`);
    numOrNull(bl.e_mpa, `${p}.bilinear.e_mpa`);
    num(bl.yield_mpa, `${p}.bilinear.yield_mpa`);
    num(bl.hardening_modulus_mpa, `${p}.bilinear.hardening_modulus_mpa`);
    numOrNull(bl.tangent_modulus_mpa, `${p}.bilinear.tangent_modulus_mpa`);
    num(bl.rmse_mpa, `${p}.bilinear.rmse_mpa`);
    const ml = obj(id.multilinear, `${p}.multilinear`);
    const mx = arr(ml.plastic_strain, `${p}.multilinear.plastic_strain`, num);
    arr(ml.stress_mpa, `${p}.multilinear.stress_mpa`, num, mx.length);
    arr(ml.extrapolated, `${p}.multilinear.extrapolated`, bool, mx.length);
    if (id.ramberg_osgood !== null) {
      const ro = obj(id.ramberg_osgood, `${p}.ramberg_osgood`);
      numOrNull(ro.e_mpa, `${p}.ramberg_osgood.e_mpa`);
      num(ro.sigma0_mpa, `${p}.ramberg_osgood.sigma0_mpa`);
      num(ro.m, `${p}.ramberg_osgood.m`);
      num(ro.rmse_mpa, `${p}.ramberg_osgood.rmse_mpa`);
    }
  }
  arr(o.warnings, `${path}.warnings`, str);
  const pr = obj(o.provenance, `${path}.provenance`);
  strRecord(pr.group, `${path}.provenance.group`);
  num(pr.n_tests, `${path}.provenance.n_tests`);
  str(pr.test_ids_sha256, `${path}.provenance.test_ids_sha256`);
  obj(pr.settings, `${path}.provenance.settings`);
  str(pr.settings_hash, `${path}.provenance.settings_hash`);
  str(pr.code_version, `${path}.provenance.code_version`);
  str(pr.generated_at, `${path}.provenance.generated_at`);
  str(pr.caution, `${path}.provenance.caution`);
  return o as unknown as DesignCurve;
}

function parseWith<T>(text: string, check: (v: unknown) => T): DesignResult<T> {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    const error: DesignError = { code: 'bad_json', message: (e as Error).message };
    return { ok: false, error };
  }
  try {
    return { ok: true, value: check(raw) };
  } catch (e) {
    if (e instanceof ShapeError) return { ok: false, error: { code: 'bad_shape', message: `${e.path} ${e.message}`, location: { path: e.path } } };
    throw e;
  }
}

export function parseDesignCurveJson(text: string): DesignResult<DesignCurve> {
  return parseWith(text, (v) => checkCurve(v, '$'));
}

export function parseDesignCurvesJson(text: string): DesignResult<DesignCurve[]> {
  return parseWith(text, (v) => arr(v, '$', checkCurve));
}
