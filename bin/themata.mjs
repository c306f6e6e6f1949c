#!/usr/bin/env node
// Entry point of the `themata` command. Registers tsx so the TypeScript sources run as they are,
// then hands over to src/cli.ts.
import { register } from 'tsx/esm/api';

register();
await import('../src/cli.ts');
