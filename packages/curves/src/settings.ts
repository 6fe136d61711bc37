/**
 * Default reduction settings: Rp0.2 and Rt0.5 (ISO 6892-1), modulus window 10 %–40 % of the first
 * yield (common practice for a least-squares modulus, cf. ASTM E111), n window 10 %–20 %
 * engineering strain (ISO 10275), and a true plastic strain grid 0 … 0.20 in steps of 0.001.
 */
import type { ReduceSettings } from './types.ts';

/** 0, 0.001, …, 0.200 (exact decimal steps, 201 values). */
export const DEFAULT_GRID: readonly number[] = Object.freeze(Array.from({ length: 201 }, (_, i) => i / 1000));

/** Frozen (arrays included): copy with spread to change a setting. */
export const DEFAULT_REDUCE_SETTINGS: ReduceSettings = Object.freeze({
  family: 'steel',
  yieldDefinition: 'rp0.2',
  rpOffsetPct: 0.2,
  rtTotalPct: 0.5,
  modulusWindow: Object.freeze([0.1, 0.4]) as unknown as [number, number],
  nWindowPct: Object.freeze([10, 20]) as unknown as [number, number],
  gridPlasticStrain: DEFAULT_GRID as number[],
  fitLaws: true,
}) as ReduceSettings;

/** Plausible modulus range per family, GPa (common practice); null: no check. */
export const MODULUS_RANGE_GPA: Record<ReduceSettings['family'], [number, number] | null> = {
  steel: [190, 220],
  aluminium: [65, 75],
  other: null,
};
