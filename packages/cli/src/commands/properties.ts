/** `fractile properties`: the per-test property table (contract keys). */
import type { Command } from 'commander';
import { globals, type CommandModule } from '../context.ts';
import { addFilterOptions, checkFilterValues, readFilter, withStore } from '../common-options.ts';
import { print } from '../output.ts';

const TABLE_COLUMNS = ['lab', 'test_id', 'grade', 'supplier', 'tested_on', 'yield_mpa', 'rm_mpa', 'ag_pct', 'a_pct', 'n_value', 'modulus_gpa', 'shape_class', 'flags', 'failure'];

export const command: CommandModule = {
  order: 30,
  register(program: Command) {
    addFilterOptions(
      program
        .command('properties')
        .description('per-test properties of the current reduction: modulus_gpa, rp02_mpa, rt05_mpa, reh_mpa, rel_mpa, ype_pct, rm_mpa, ag_pct, agt_pct, a_pct, yt_ratio, n_value, k_mpa, yield_mpa, flags'),
    )
      .option('--failed', 'also list tests whose reduction failed, with the reason')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { contractView, loadProperties, propertyCsvRows, PROPERTY_CSV_COLUMNS, PROPERTY_NOTES } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const filter = readFilter(o);
        await withStore(g, async (store) => {
          await checkFilterValues(store.db, filter);
          const rows = await loadProperties(store.db, { ...filter, includeFailed: Boolean(o.failed) }, { asReduced: true });
          const view = rows.map(contractView);
          print(g, {
            kind: 'properties',
            data: view,
            rows: propertyCsvRows(view),
            columns: PROPERTY_CSV_COLUMNS,
            tableColumns: TABLE_COLUMNS,
            title: 'fractile per-test properties (ISO 6892-1 quantities), one row per test',
            notes: PROPERTY_NOTES,
            provenance: { filter, failed_included: Boolean(o.failed) },
          });
        });
      });
  },
};
