import type { GroupKey } from './types.ts';

/** Human label of a group: "grade G355 · supplier Northmill" (key order as given). */
export function groupLabel(group: GroupKey): string {
  const entries = Object.entries(group);
  if (entries.length === 0) return 'all tests';
  return entries.map(([k, v]) => `${k} ${v}`).join(' · ');
}

/** Order-independent identity of a group, for matching stage rows to each other. */
export function groupId(group: GroupKey): string {
  return JSON.stringify(Object.entries(group).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)));
}
