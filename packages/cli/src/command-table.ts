/**
 * Every command of `fractile`, one line each: a new command is a file in ./commands exporting
 * `command: CommandModule` and one line here (cli-commands.test.ts checks that every file of the
 * folder is listed). `--help` lists them in their `order`. A static table, not a folder scan, so
 * that the compiled CLI needs no file-system lookup and no loader to start.
 */
export { command as init } from './commands/init.ts';
export { command as ingest } from './commands/ingest.ts';
export { command as tests } from './commands/tests.ts';
export { command as reduce } from './commands/reduce.ts';
export { command as properties } from './commands/properties.ts';
export { command as stats } from './commands/stats.ts';
export { command as curves } from './commands/curves.ts';
export { command as drift } from './commands/drift.ts';
export { command as exclude } from './commands/exclude.ts';
export { command as alerts } from './commands/alerts.ts';
export { command as sample } from './commands/sample.ts';
export { command as distributions } from './commands/distributions.ts';
export { command as plan } from './commands/plan.ts';
export { command as report } from './commands/report.ts';
export { command as run } from './commands/run.ts';
export { command as demo } from './commands/demo.ts';
export { command as worker } from './commands/worker.ts';
export { command as queue } from './commands/queue.ts';
