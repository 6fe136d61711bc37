/**
 * The message for a unit that is not known for a column: names the unit and the quantity, and
 * where only the letter case differs from a known symbol (`mPa`, `Mm`, `KN`), says so and names
 * the symbol meant — units are case-sensitive (see curves/units.ts), so it is not read as that.
 */
import { caseHint } from '@fractile/curves';

export function unknownUnitMessage(unit: string, column: string, quantity: string): string {
  const hint = caseHint(unit);
  const why = hint ? `; unit symbols are case-sensitive: did you mean "${hint}"?` : '';
  return `unknown unit "${unit}" for ${column} (a ${quantity})${why}`;
}
