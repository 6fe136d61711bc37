/**
 * The `fractile` command: the commands of command-table.ts, registered in their `order`.
 */
import { Command } from 'commander';
import * as table from './command-table.ts';
import type { CommandModule } from './context.ts';
import { CliError, globals, reportFailure } from './context.ts';
import { catalogPath } from './common-options.ts';
import { CODE_VERSION } from './version.ts';

export async function buildProgram(): Promise<Command> {
  const program = new Command('fractile');
  program
    .description('Tensile tests in, characteristic design values out: ingest, reduce, statistics, curves, drift and reports.')
    .version(CODE_VERSION)
    .option('--db <url|path>', 'database: a folder for the embedded database, or postgres://user@host:port/db (default: $DATABASE_URL, else the "database" of ./fractile.json, else ./.fractile/db)')
    .option('--format <format>', 'output format: table, json or csv', 'table')
    .option('--wait <seconds>', 'embedded database: wait this long for another fractile process using the folder (default: fail at once, exit 4)')
    .option('--no-comments', 'CSV without the comment block above the header (for spreadsheet import); the caution and provenance go to --sidecar FILE, or the caution to stderr')
    .option('--sidecar <file>', 'with --format csv --no-comments: write the provenance (JSON envelope) to this file')
    .option('--debug', 'print the stack of an unexpected error')
    .showHelpAfterError()
    // usage errors exit with 2 like every other bad input (commander's own default is 1)
    .exitOverride((err) => process.exit(err.exitCode === 0 ? 0 : 2))
    .configureOutput({ writeOut: (s) => process.stdout.write(s), writeErr: (s) => process.stderr.write(s) });

  const modules: CommandModule[] = Object.values(table).sort((a, b) => a.order - b.order);
  for (const m of modules) m.register(program);
  // a wrong catalog (--catalog, or the project file's) is refused before any database is opened
  program.hook('preAction', async (_root, action) => {
    if (!action.options.some((o) => o.attributeName() === 'catalog')) return;
    const file = catalogPath(action.opts().catalog, globals(action));
    if (file === null) return;
    const { loadCatalog } = await import('@fractile/pipeline');
    loadCatalog(file);
  });
  return program;
}

async function main(): Promise<void> {
  const debug = process.argv.includes('--debug');
  // an error nobody awaited (from a library's background work, e.g. a connection the server
  // ended): Node would print its stack and exit 1; we print it as every other failure and exit
  const fatal = (err: unknown) => process.exit(reportFailure(err, debug) || 1);
  process.on('unhandledRejection', fatal);
  process.on('uncaughtException', fatal);
  const program = await buildProgram();
  try {
    await program.parseAsync(process.argv);
  } catch (err) {
    process.exitCode = reportFailure(err, debug);
  }
}

if (process.argv[1] && (process.argv[1].endsWith('fractile') || process.argv[1].endsWith('fractile.js') || process.argv[1].endsWith('main.ts'))) {
  await main();
}

export { CliError };
