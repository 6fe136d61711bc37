/**
 * The `fractile` command. Every file in ./commands exports `command: CommandModule`; they are
 * registered in their `order`, so a new command is a new file and nothing else.
 */
import { Command } from 'commander';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { CommandModule } from './context.ts';
import { CliError, reportFailure } from './context.ts';
import { CODE_VERSION } from './version.ts';

const here = dirname(fileURLToPath(import.meta.url));

export async function buildProgram(): Promise<Command> {
  const program = new Command('fractile');
  program
    .description('Tensile tests in, characteristic design values out: ingest, reduce, statistics, curves, drift and reports.')
    .version(CODE_VERSION)
    .option('--db <url|path>', 'database: a folder for the embedded database, or postgres://… (default: $DATABASE_URL, else ./.fractile/db)')
    .option('--format <format>', 'output format: table, json or csv', 'table')
    .option('--wait <seconds>', 'embedded database: wait this long for another fractile process using the folder (default: fail at once, exit 4)')
    .showHelpAfterError()
    // usage errors exit with 2 like every other bad input (commander's own default is 1)
    .exitOverride((err) => process.exit(err.exitCode === 0 ? 0 : 2))
    .configureOutput({ writeOut: (s) => process.stdout.write(s), writeErr: (s) => process.stderr.write(s) });

  const dir = join(here, 'commands');
  const files = readdirSync(dir).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'));
  const modules: CommandModule[] = [];
  for (const f of files) {
    const mod = (await import(pathToFileURL(join(dir, f)).href)) as { command?: CommandModule };
    if (mod.command) modules.push(mod.command);
  }
  modules.sort((a, b) => a.order - b.order);
  for (const m of modules) m.register(program);
  return program;
}

async function main(): Promise<void> {
  const program = await buildProgram();
  try {
    await program.parseAsync(process.argv);
  } catch (err) {
    process.exitCode = reportFailure(err);
  }
}

if (process.argv[1] && (process.argv[1].endsWith('fractile') || process.argv[1].endsWith('fractile.js') || process.argv[1].endsWith('main.ts'))) {
  await main();
}

export { CliError };
