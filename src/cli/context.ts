// What every command needs: where to write, the data folder, a store opened once, progress bars
// on stderr, and the column-mapping flags shared by import and apply.
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { SingleBar } from 'cli-progress';
import type { Command } from 'commander';
import { openStore, type Store } from '../store/index.js';
import { InputError, type ColumnMapping, type CovariateType } from '../text/index.js';
import type { WorkbenchServer } from './admin-commands.js';

export interface CliIo {
  readonly stdout: { write(text: string): unknown };
  /** A stream; progress bars draw only when it is a terminal. */
  readonly stderr: NodeJS.WritableStream & { isTTY?: boolean };
  /** Whole standard input as text (for passwords). */
  readStdin(): Promise<string>;
}

/** What the composition root (src/main.ts) gives the command line besides its streams. */
export interface CliDeps {
  /** The workbench for `serve`; without it `serve` says the workbench is not part of this command. */
  readonly server?: WorkbenchServer;
}

export class CliContext {
  private store: Store | undefined;
  private readonly cleanups: (() => void)[] = [];

  constructor(
    readonly io: CliIo,
    private readonly dataDirOf: () => string,
    readonly deps: CliDeps = {},
  ) {}

  get dataDir(): string {
    return this.dataDirOf();
  }

  /** The data folder's store, opened on first use and closed when the command ends. */
  openStore(): Store {
    this.store ??= openStore(this.dataDir);
    return this.store;
  }

  out(line: string): void {
    this.io.stdout.write(line.endsWith('\n') ? line : `${line}\n`);
  }

  err(line: string): void {
    this.io.stderr.write(line.endsWith('\n') ? line : `${line}\n`);
  }

  /** A progress bar on stderr (silent when stderr is not a terminal). */
  progressBar(format: string): SingleBar {
    const bar = new SingleBar({ stream: this.io.stderr, format, hideCursor: true, clearOnComplete: true, etaBuffer: 20, fps: 5 });
    this.cleanups.push(() => bar.stop());
    return bar;
  }

  onClose(fn: () => void): void {
    this.cleanups.push(fn);
  }

  close(): void {
    for (const fn of this.cleanups.splice(0).reverse()) {
      try {
        fn();
      } catch {
        // closing is best effort
      }
    }
    this.store?.close();
    this.store = undefined;
  }
}

export async function readInputFile(path: string): Promise<{ bytes: Uint8Array; fileName: string }> {
  try {
    return { bytes: new Uint8Array(await readFile(path)), fileName: basename(path) };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(code === 'ENOENT' ? `There is no file ${path}.` : code === 'EISDIR' ? `${path} is a folder, not a file.` : `Cannot read ${path} (${code ?? 'error'}).`, path);
  }
}

export function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** Add the column-mapping flags of `import` (and `apply`) to a command. */
export function mappingOptions(cmd: Command): Command {
  return cmd
    .option('--text <col>', 'column with answers (repeat for several questions)', collect, [])
    .option('--id <col>', 'column with each row\'s id (default: row number)')
    .option('--lang <col>', 'column with the declared language of each row')
    .option('--link <col>', 'column whose equal values link translations or paired answers')
    .option('--covariate <col[:numeric]>', 'metadata column (repeat); add :numeric for numbers', collect, [])
    .option('--weight <col>', 'column with survey weights (positive numbers)')
    .option('--sheet <name>', 'sheet of an XLSX workbook (default: the first)');
}

export interface MappingFlags {
  text: string[];
  id?: string;
  lang?: string;
  link?: string;
  covariate: string[];
  weight?: string;
}

export function mappingFromFlags(flags: MappingFlags): ColumnMapping {
  const covariates = flags.covariate.map((spec) => {
    const m = /^(.*?)(?::(numeric|categorical))?$/.exec(spec)!;
    if (!m[1]) throw new InputError(`--covariate needs a column name (got "${spec}").`);
    return { column: m[1], type: (m[2] ?? 'categorical') as CovariateType };
  });
  return {
    text: flags.text,
    covariates,
    ...(flags.id ? { id: flags.id } : {}),
    ...(flags.lang ? { language: flags.lang } : {}),
    ...(flags.link ? { link: flags.link } : {}),
    ...(flags.weight ? { weight: flags.weight } : {}),
  };
}

export function parseNumber(name: string, value: string | undefined, kind: 'int' | 'float' = 'int'): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (!Number.isFinite(n) || (kind === 'int' && !Number.isInteger(n))) throw new InputError(`${name} needs ${kind === 'int' ? 'a whole number' : 'a number'} (got "${value}").`);
  return n;
}

export function formatCounts(counts: Record<string, number>): string {
  const entries = Object.entries(counts).sort((a, b) => b[1] - a[1]);
  return entries.length ? entries.map(([k, v]) => `${k} ${v}`).join(', ') : 'none';
}
