/**
 * Every migration, keyed by its file name without extension (the name kysely records); applied
 * in name order. A new step is a file `NNNN-name.ts` here exporting `up` (and `down`), its import
 * and its entry below (raw tables 00xx, results tables 01xx).
 */
import type { Migration } from 'kysely';
import * as raw from './0001-raw.ts';
import * as exclusions from './0010-exclusions.ts';
import * as runAbandoned from './0020-ingest-run-abandoned.ts';
import * as alertActions from './0030-alert-actions.ts';
import * as curvesBytea from './0040-curves-bytea.ts';
import * as queueRequests from './0060-queue-requests.ts';
import * as results from './0100-results.ts';
import * as driftAlerts from './0120-drift-alerts.ts';
import * as stageRunAbandoned from './0140-stage-run-abandoned.ts';
import * as stageRunQueueJob from './0180-stage-run-queue-job.ts';

export const MIGRATIONS: Record<string, Migration> = {
  '0001-raw': raw,
  '0010-exclusions': exclusions,
  '0020-ingest-run-abandoned': runAbandoned,
  '0030-alert-actions': alertActions,
  '0040-curves-bytea': curvesBytea,
  '0060-queue-requests': queueRequests,
  '0100-results': results,
  '0120-drift-alerts': driftAlerts,
  '0140-stage-run-abandoned': stageRunAbandoned,
  '0180-stage-run-queue-job': stageRunQueueJob,
};
