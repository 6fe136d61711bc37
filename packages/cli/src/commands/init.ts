/**
 * `fractile init [FOLDER]`: writes starter files into a folder (default: the working folder): a
 * manifest with two example rows (one with a curve file, one summary-only), the curve file, a
 * column map, a grade catalog and a fractile.json naming them, so that `cd FOLDER && fractile
 * ingest && fractile stats` works at once. Refuses to overwrite any existing file (exit 2, naming
 * them) unless --force; opens no database.
 */
import type { Command } from 'commander';
import { existsSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { starterFiles } from '../starter-files.ts';

export const command: CommandModule = {
  order: 5,
  register(program: Command) {
    program
      .command('init')
      .description('write starter files (manifest, example curve, column map, catalog, fractile.json) into a folder')
      .argument('[folder]', 'folder to write into (created if missing)', '.')
      .option('--force', 'overwrite files that already exist')
      .addHelpText('after', '\nExit status: 0 written, 2 when a file exists already (nothing is written) or the folder cannot be used.')
      .action((folder: string, o: { force?: boolean }, cmd: Command) => {
        // a broken ./fractile.json in the working folder must not stop writing a new one
        const g = globals(cmd, { project: false });
        const root = resolve(folder);
        if (existsSync(root) && !statSync(root).isDirectory()) throw new CliError(`${folder} is not a folder`);
        const files = starterFiles();
        const present = files.map(([rel]) => rel).filter((rel) => existsSync(join(root, rel)));
        if (present.length > 0 && !o.force) throw new CliError(`init: ${present.map((p) => join(folder, p)).join(', ')} already exist${present.length === 1 ? 's' : ''}: nothing was written (--force overwrites)`);
        for (const [rel, content] of files) {
          const target = join(root, rel);
          mkdirSync(dirname(target), { recursive: true });
          writeFileSync(target, content);
        }
        const rel = relative(process.cwd(), root);
        const shown = rel === '' ? '.' : rel.startsWith('..') ? root : rel;
        const written = files.map(([rel]) => ({ file: join(shown, rel), overwritten: present.includes(rel) }));
        for (const w of written) log(`init: wrote ${w.file}${w.overwritten ? ' (overwritten)' : ''}`);
        const cd = shown === '.' ? '' : `cd ${shown} && `;
        log(`init: next: ${cd}fractile ingest && fractile stats — then put your own rows into manifest.csv (docs/input-formats.md describes every column)`);
        print(g, { kind: 'init', data: { folder: root, written }, rows: written, title: 'fractile init: the starter files written', result: false });
      });
  },
};
