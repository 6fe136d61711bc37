/**
 * `fractile exclude` / `fractile include`: leave tests out of every statistic with a recorded
 * reason, or take them back. Each decision is a stored row (test, action, reason, who, when);
 * nothing is deleted, raw rows stay untouched, and the next stats, curves, drift and report runs
 * honour the state. Test ids are `lab/test_id`, or a `test_id` stored in one lab only; an unknown
 * or ambiguous id stops the command before anything is written.
 */
import type { Command } from 'commander';
import { userInfo } from 'node:os';
import type { ExclusionDecision } from '@fractile/store';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { withStore } from '../common-options.ts';

function who(o: Record<string, unknown>): string {
  if (typeof o.by === 'string' && o.by.trim()) return o.by.trim();
  try {
    return process.env.USER || userInfo().username || 'unknown';
  } catch {
    return 'unknown';
  }
}

async function decide(action: 'exclude' | 'include', refs: string[], o: Record<string, unknown>, cmd: Command): Promise<void> {
  const g = globals(cmd);
  const reason = typeof o.reason === 'string' ? o.reason.trim() : '';
  if (action === 'exclude' && !reason) throw new CliError('exclude needs --reason "…" (why the test is left out)');
  if (refs.length === 0) throw new CliError(`${action} needs at least one test id (lab/test_id or test_id)`);
  await withStore(g, async (store) => {
    const { activeExclusions, recordExclusions, resolveTestRefs } = await import('@fractile/store');
    const { resolved, errors } = await resolveTestRefs(store.db, refs);
    if (errors.length > 0) throw new CliError(errors.map((e) => e.message).join('\n'));
    const active = new Map((await activeExclusions(store.db)).map((e) => [`${e.lab}/${e.test_id}`, e]));
    const decisions: ExclusionDecision[] = [];
    const notes: string[] = [];
    for (const t of resolved) {
      const key = `${t.lab}/${t.test_id}`;
      const cur = active.get(key);
      if (action === 'include' && !cur) {
        notes.push(`${key} is not excluded: nothing recorded`);
        continue;
      }
      if (action === 'exclude' && cur) notes.push(`${key} was already excluded (${cur.reason}); the new reason is recorded`);
      decisions.push({ lab: t.lab, test_id: t.test_id, test_row_id: t.row_id, action, reason: reason || '(no reason given)', decided_by: who(o) });
    }
    const ids = await store.transaction((trx) => recordExclusions(trx, decisions));
    for (const n of notes) log(`${action}: ${n}`);
    log(`${action}: ${decisions.length} decision(s) recorded`);
    const rows = decisions.map((d, i) => ({ id: ids[i], test: `${d.lab}/${d.test_id}`, action: d.action, reason: d.reason, by: d.decided_by }));
    print(g, { kind: action, data: { recorded: rows, notes }, rows, title: `fractile ${action}: the decisions recorded`, result: false });
  });
}

export const command: CommandModule = {
  order: 36,
  register(program: Command) {
    program
      .command('exclude')
      .description('leave tests out of every statistic (stats, curves, drift, sample, report), with a recorded reason; undo with `fractile include`')
      .argument('<tests...>', 'test ids: lab/test_id, or test_id where it is unique over labs')
      .requiredOption('--reason <text>', 'why the tests are left out (recorded with who and when)')
      .option('--by <name>', 'who decides (default: the login name)')
      .action((refs: string[], o: Record<string, unknown>, cmd: Command) => decide('exclude', refs, o, cmd));
    program
      .command('include')
      .description('take excluded tests back into the statistics (recorded as a decision; the exclusion stays in the history)')
      .argument('<tests...>', 'test ids: lab/test_id, or test_id where it is unique over labs')
      .option('--reason <text>', 'why the tests are taken back')
      .option('--by <name>', 'who decides (default: the login name)')
      .action((refs: string[], o: Record<string, unknown>, cmd: Command) => decide('include', refs, o, cmd));
    program
      .command('exclusions')
      .description('list the tests excluded now, with reason, who and when (--history: every decision)')
      .option('--history', 'every exclude and include decision, oldest first')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const g = globals(cmd);
        await withStore(g, async (store) => {
          const { activeExclusions, exclusionHistory } = await import('@fractile/store');
          const rows = o.history ? await exclusionHistory(store.db) : await activeExclusions(store.db);
          const flat = rows.map((r) => ({ test: `${r.lab}/${r.test_id}`, action: r.action, reason: r.reason, by: r.decided_by, at: r.decided_at }));
          print(g, { kind: 'exclusions', data: rows, rows: flat, title: o.history ? 'fractile exclusion history: every exclude and include decision' : 'fractile exclusions: the tests left out of every statistic now', result: false });
        });
      });
  },
};
