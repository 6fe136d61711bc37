/**
 * The plastic-strain grid shared by a group's tests (each grade is reduced on its grade's grid),
 * or null when the tests were reduced on different grids or a grade has none: curves of one
 * group are compared point by point only on one grid.
 */
import type { PropertyRow } from './properties.ts';

export function commonGrid(members: readonly Pick<PropertyRow, 'grade'>[], grids: Record<string, number[]>): number[] | null {
  if (members.length === 0) return null;
  const seen = new Set(members.map((r) => JSON.stringify(grids[r.grade] ?? null)));
  return seen.size === 1 ? (grids[members[0].grade] ?? null) : null;
}
