/**
 * `fractile alerts`: the drift alerts of the last drift run with their state, and what a user
 * says of them — acknowledge (with a note), close, reopen — each recorded with who and when.
 */
import { userInfo } from 'node:os';
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { grouped, print } from '../output.ts';
import { withStore } from '../common-options.ts';

const STATES = ['open', 'acknowledged', 'closed', 'all'] as const;

function actor(o: { by?: string }): string {
  const who = o.by ?? process.env.USER ?? userInfo().username;
  if (!who?.trim()) throw new CliError('name who acts with --by NAME');
  return who.trim();
}

function act(parent: Command, name: string, action: 'acknowledge' | 'close' | 'reopen', description: string, noteRequired: boolean) {
  parent
    .command(`${name} <ids...>`)
    .description(description)
    .option('--note <text>', noteRequired ? 'what was found or done (required)' : 'why (optional)')
    .option('--by <name>', 'who acts (default: the login name)')
    .action(async (ids: string[], o: { note?: string; by?: string }, cmd: Command) => {
      const g = globals(cmd);
      if (noteRequired && !(o.note?.trim())) throw new CliError(`fractile alerts ${name} needs --note TEXT: say what was found or done`);
      const bad = ids.filter((id) => !/^[0-9a-f]{12}$/.test(id));
      if (bad.length) throw new CliError(`alert ids are 12 hex digits as \`fractile alerts\` prints them, got "${bad.join('", "')}"`);
      const { recordAlertAction, AlertStateError } = await import('@fractile/pipeline');
      const by = actor(o);
      await withStore(g, async (store) => {
        try {
          await recordAlertAction(store.db, ids, action, by, o.note?.trim() || null);
        } catch (e) {
          if (e instanceof AlertStateError) throw new CliError(e.message);
          throw e;
        }
        log(`alerts: ${ids.length} ${action === 'acknowledge' ? 'acknowledged' : action === 'close' ? 'closed' : 'reopened'} by ${by}`);
        print(g, { kind: 'alert-action', data: { action, ids, by, note: o.note?.trim() || null }, rows: ids.map((id) => ({ id, action, by, note: o.note ?? null })), title: `fractile alerts ${name}: the decisions recorded`, result: false });
      });
    });
}

export const command: CommandModule = {
  order: 61,
  register(program: Command) {
    const alerts = program.command('alerts').description('drift alerts with their state (open, acknowledged, closed); acknowledge, close or reopen them');
    alerts
      .command('list', { isDefault: true })
      .description('the alerts of the last drift run with their state')
      .option('--state <state>', `only alerts in this state: ${STATES.join(', ')}`, 'all')
      .action(async (o: { state: string }, cmd: Command) => {
        const g = globals(cmd);
        if (!(STATES as readonly string[]).includes(o.state)) throw new CliError(`--state must be one of ${STATES.join(', ')}, got "${o.state}"`);
        const { latestDriftAlerts } = await import('@fractile/pipeline');
        await withStore(g, async (store) => {
          const last = await latestDriftAlerts(store);
          if (!last) throw new CliError('drift has not been run yet: run `fractile drift` first');
          const shown = last.alerts.filter((a) => o.state === 'all' || a.state === o.state);
          log(`alerts: ${shown.length} of ${last.alerts.length} from drift run ${last.run}`);
          const view = grouped(shown.map((a) => ({ group: a.group, row: { id: a.id, state: a.state, by: a.state_by, note: a.state_note, property: a.property, rule: a.rule, detected_on: a.detected_on, change_date: a.change_date, magnitude: a.magnitude, unit: a.magnitude_unit } })));
          print(g, { kind: 'alerts', data: { run: last.run, alerts: shown }, ...view, title: 'fractile drift alerts with their state', provenance: { drift_run: last.run, state: o.state } });
        });
      });
    act(alerts, 'ack', 'acknowledge', 'acknowledge alerts: seen and being looked into (needs --note)', true);
    act(alerts, 'close', 'close', 'close alerts: dealt with', false);
    act(alerts, 'reopen', 'reopen', 'reopen closed or acknowledged alerts', false);
  },
};
