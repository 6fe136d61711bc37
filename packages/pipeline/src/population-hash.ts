/**
 * Input hash of a stage that reads the population: the tests it uses (row and settings hash of
 * their results), the tests left out by an exclusion, and what each row withholds, so that an
 * exclusion, its undo, or a changed flag rule changes the hash and a stored run is reused only
 * for the same inputs.
 */
import { hashOf } from './hash.ts';
import type { Population } from './population.ts';

export function populationHash(pop: Pick<Population, 'rows' | 'excluded' | 'options'>): string {
  return hashOf({
    rows: pop.rows.map((r) => `${r.test_pk}:${r.settings_hash}${r.withheld && Object.keys(r.withheld).length ? ':' + Object.keys(r.withheld).sort().join(',') : ''}`),
    excluded: pop.excluded.map((r) => r.test_pk),
    options: pop.options,
  });
}
