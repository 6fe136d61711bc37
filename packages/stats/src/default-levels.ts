/**
 * The default levels of the characteristic values, the one source for every stage and command:
 * the first is the headline (coverage p = 0.95, i.e. the 5 % fractile, at confidence γ = 0.75),
 * the others are reported beside it. Light on purpose (no imports), so the command line can read
 * its option defaults from here at start.
 */
import type { SummaryLevel } from './characteristic-types.ts';

export const DEFAULT_LEVELS: readonly SummaryLevel[] = [
  { coverage: 0.95, confidence: 0.75 },
  { coverage: 0.99, confidence: 0.95 },
  { coverage: 0.9, confidence: 0.95 },
];

/** The headline level: coverage and confidence of the design value and of the characteristic curve. */
export const HEADLINE_LEVEL: SummaryLevel = DEFAULT_LEVELS[0];
