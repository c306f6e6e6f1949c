#!/usr/bin/env node
// Entry point of the `themata` command. Registers tsx with the package's own tsconfig.json (not
// the one of the folder the command is started from, which may hold none or another project's:
// issue 13), then hands over to src/main.ts. TSX_TSCONFIG_PATH carries the same file to worker
// threads and child processes (tsx 4.23 reads it when register() is given no tsconfig).
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

const tsconfig = fileURLToPath(new URL('../tsconfig.json', import.meta.url));
process.env.TSX_TSCONFIG_PATH = tsconfig;
register({ tsconfig });
await import('../src/main.ts');
