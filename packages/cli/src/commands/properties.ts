/** `fractile properties`: the per-test property table (contract keys). */
import type { Command } from 'commander';
import { emit, globals, type CommandModule } from '../context.ts';
import { addFilterOptions, readFilter, withStore } from '../common-options.ts';

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
        const { contractView, loadProperties, PROPERTY_ROW_KEYS } = await import('@fractile/pipeline');
        const g = globals(cmd);
        await withStore(g, async (store) => {
          const rows = await loadProperties(store.db, { ...readFilter(o), includeFailed: Boolean(o.failed) }, { asReduced: true });
          const view = rows.map(contractView);
          const flat = view.map((r) => ({ ...r, flags: (r.flags as string[]).join(' '), failure: r.failure ? `${(r.failure as { code: string }).code}: ${(r.failure as { message: string }).message}` : null }));
          const columns = [...PROPERTY_ROW_KEYS, 'given', 'failure'];
          emit(g.format, view, flat, g.format === 'table' ? ['lab', 'test_id', 'grade', 'supplier', 'tested_on', 'yield_mpa', 'rm_mpa', 'ag_pct', 'a_pct', 'n_value', 'modulus_gpa', 'shape_class', 'flags', 'failure'] : columns);
        });
      });
  },
};
