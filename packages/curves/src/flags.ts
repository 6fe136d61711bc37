/**
 * The stable vocabulary of result flags and failure codes (snake_case strings stored with each
 * result). Extend by adding entries; never rename one.
 */

export const FLAGS = {
  given: 'values were taken from a summary record (certificate), not computed from a curve',
  noisy: 'stress noise above 0.5 % of Rm (estimated from second differences of the record)',
  slipping: 'sudden force drops or extension jumps outside yielding and unloading (grip or knife-edge slip)',
  extensometer_removed_early: 'the extension channel stops (blank or frozen) before fracture; A and At are not given, Ag/Agt only if maximum force came first',
  unload_reload: 'the record contains unload–reload loops; they are cut out of the monotonic curve and their unloading moduli are in details.loops',
  crosshead_only_modulus: 'strain from the crosshead: E is the fitted slope, not representative of the material; yield values use this slope',
  elongation_from_crosshead: 'strain from the crosshead: Ag, Agt, A, Rt, the yield-point extension and the grid curve are not given (crosshead travel is not the extension over L0)',
  modulus_implausible: 'E outside the family range (steel 190–220 GPa, aluminium 65–75 GPa)',
  modulus_poor_fit: 'the straight-line fit of the elastic window has R² below 0.995 or fewer than 8 points',
  past_max_force_ignored: 'points after maximum force are left out of the true curve, n and the law fits (details.points_past_max_force)',
  n_window_reduced: 'uniform elongation (or the yield-point extension) left less than the n window; a smaller window was used (details.n_window_pct)',
  n_window_short: 'fewer than 5 points in the n window; n and K are not given',
  yield_definition_not_applicable: 'the requested yield definition does not exist on this curve (ReH/ReL on a continuous curve); yield_mpa is null',
  yield_definition_differs: 'summary record: the given yield is of another definition than the grade asks for; yield_mpa is null',
  yield_definition_assumed: 'summary record without a yield definition: the grade\'s definition was assumed',
  rp_not_reached: 'the curve does not reach the plastic extension of Rp before fracture',
  rt_not_reached: 'the curve does not reach the total extension of Rt before fracture',
  fracture_not_detected: 'no final force drop: the last point is taken as fracture',
  spikes_removed: 'isolated glitches (single points far off both neighbours) were left out (details.spikes)',
} as const;

export type FlagName = keyof typeof FLAGS;
export const FLAG_NAMES = Object.keys(FLAGS) as FlagName[];

export const FAILURE_CODES = {
  bad_settings: 'the reduction settings are invalid (a window with lo ≥ hi, a non-positive offset, a grid not increasing)',
  no_channels: 'the record has neither force (or stress) nor extension (or crosshead, or strain)',
  missing_geometry: 'S0 or L0 is needed to turn the channels into stress and strain but is missing or not positive',
  channel_length_mismatch: 'the channels have different lengths',
  too_short: 'fewer than 20 usable points, or no strain beyond the elastic part',
  no_elastic_part: 'no straight rising part to fit the modulus to (fewer than 3 points in the window or a non-positive slope)',
  no_maximum: 'the record ends while the force still rises (no fall after the highest point beyond 4× the noise and 0.1 % of it): maximum force not reached',
  too_noisy: 'stress noise above 3 % of Rm',
} as const;

export type FailureCode = keyof typeof FAILURE_CODES;
