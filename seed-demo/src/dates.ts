/**
 * Calendar days as integers (days since 1970-01-01, UTC) and ISO 8601 dates. Pure arithmetic on
 * given dates; never reads the clock.
 */
const DAY_MS = 86_400_000;

export function dayOf(iso: string): number {
  return Math.round(Date.parse(`${iso}T00:00:00Z`) / DAY_MS);
}

export function isoOf(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

export function yearOf(day: number): number {
  return new Date(day * DAY_MS).getUTCFullYear();
}
