/**
 * The state of drift alerts. An alert's id is a hash of its group, property, rule and the date it
 * would have rung (`detected_on`): the charts are judged on past data only, so a rerun on more
 * data reports an alert already seen under the same id. Every id ever reported is registered
 * with the run that first reported it (`drift_alerts`), which tells a rerun what is new; what
 * users say — acknowledge (with a note), close, reopen, each with who — is appended to
 * `alert_actions`, and an alert's state is its latest action: open (none, or reopened),
 * acknowledged, closed.
 */
import type { Kysely } from 'kysely';
import type { Database } from '@fractile/store';
import { canonicalJson, sha256Hex } from '../hash.ts';

export type AlertState = 'open' | 'acknowledged' | 'closed';
export type AlertAction = 'acknowledge' | 'close' | 'reopen';

export const ALERT_ACTIONS: readonly AlertAction[] = ['acknowledge', 'close', 'reopen'];

const STATE_OF: Record<AlertAction, AlertState> = { acknowledge: 'acknowledged', close: 'closed', reopen: 'open' };

export interface AlertIdentity {
  group: Record<string, string>;
  property: string;
  rule: string;
  detected_on: string;
}

export interface AlertStatus {
  state: AlertState;
  /** Who and what of the latest action, if any. */
  by: string | null;
  note: string | null;
  at: string | null;
}

export class AlertStateError extends Error {
  readonly code = 'unknown_alert';
}

/** 12 hex digits of SHA-256 over the canonical JSON of the identity. */
export function alertId(a: AlertIdentity): string {
  return sha256Hex(canonicalJson({ group: a.group, property: a.property, rule: a.rule, detected_on: a.detected_on })).slice(0, 12);
}

/**
 * Registers the alerts of a drift run; returns the ids not registered before (new since the
 * last run). Concurrent runs each get back only the ids they inserted.
 */
export async function registerAlerts(db: Kysely<Database>, runId: number, alerts: readonly (AlertIdentity & { id: string })[]): Promise<Set<string>> {
  const fresh = new Set<string>();
  const chunk = 500;
  for (let i = 0; i < alerts.length; i += chunk) {
    const rows = alerts.slice(i, i + chunk).map((a) => ({ alert_id: a.id, group_key: JSON.stringify(a.group), property: a.property, rule: a.rule, detected_on: a.detected_on, first_run: runId }));
    const inserted = await db.insertInto('drift_alerts').values(rows).onConflict((oc) => oc.column('alert_id').doNothing()).returning('alert_id').execute();
    for (const r of inserted) fresh.add(r.alert_id);
  }
  return fresh;
}

/** Latest action of each id (ids without one are open). */
export async function alertStatuses(db: Kysely<Database>, ids: readonly string[]): Promise<Map<string, AlertStatus>> {
  const out = new Map<string, AlertStatus>();
  if (ids.length === 0) return out;
  const rows = await db.selectFrom('alert_actions').select(['alert_id', 'action', 'actor', 'note', 'acted_at']).where('alert_id', 'in', [...ids]).orderBy('id').execute();
  for (const r of rows) out.set(r.alert_id, { state: STATE_OF[r.action], by: r.actor, note: r.note, at: new Date(r.acted_at).toISOString() });
  return out;
}

/**
 * Records one action on each of `ids`, after checking every id was reported by some drift run
 * (an unknown id is an error naming it, and nothing is recorded).
 */
export async function recordAlertAction(db: Kysely<Database>, ids: readonly string[], action: AlertAction, actor: string, note: string | null): Promise<void> {
  if (!actor.trim()) throw new AlertStateError('who acts on the alert must be named');
  const known = new Set((await db.selectFrom('drift_alerts').select('alert_id').where('alert_id', 'in', [...ids]).execute()).map((r) => r.alert_id));
  const unknown = ids.filter((id) => !known.has(id));
  if (unknown.length > 0) throw new AlertStateError(`no drift alert has the id ${unknown.join(', ')} (see \`fractile alerts\`)`);
  await db.insertInto('alert_actions').values(ids.map((alert_id) => ({ alert_id, action, actor, note }))).execute();
}
