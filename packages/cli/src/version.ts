/** The code version recorded beside every stored result (package version + algorithm epoch). */
import { readFileSync } from 'node:fs';

const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string };
export const CODE_VERSION: string = pkg.version;
