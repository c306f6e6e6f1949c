// themata languages: every answer's language decision as CSV (declared, written and decided side
// by side, with answers written in two languages marked), and the review actions of the
// Languages page: accept the written language for some answers or all, or set one by hand.
import { writeFile } from 'node:fs/promises';
import type { Command } from 'commander';
import { requireStudy } from '../services/index.js';
import { csvBytes, toCsv } from '../services/index.js';
import { acceptWrittenLanguages, setAnswerLanguages } from '../services/index.js';
import { iterateDocuments, type DocumentFilter } from '../store/index.js';
import { InputError } from '../text/index.js';
import type { CliContext } from './context.js';

interface LanguageFlags {
  study: string;
  out?: string;
  disagreements?: boolean;
  mixed?: boolean;
  undetermined?: boolean;
  acceptWritten?: string | boolean;
  set?: string;
  rows?: string;
}

const HEADER = ['id', 'question', 'language', 'source', 'confidence', 'declared', 'written', 'declared check', 'mixed with', 'mixed share'];

function list(value: string | undefined): string[] {
  return (value ?? '').split(',').map((s) => s.trim()).filter((s) => s !== '');
}

export function registerLanguageCommand(program: Command, ctx: CliContext): void {
  program
    .command('languages')
    .description(`list every answer's language decision as CSV (${HEADER.join(',')}), or change decisions`)
    .requiredOption('--study <name>', 'study name')
    .option('--out <file>', 'write the CSV to this file (UTF-8 with BOM) instead of standard output')
    .option('--disagreements', 'only answers whose declared language differs from the language written or decided')
    .option('--mixed', 'only answers written in two languages')
    .option('--undetermined', 'only answers with no language decided')
    .option('--accept-written [rows]', 'take the language each answer is written in, for these row ids (comma-separated) or, without a list, for every answer where it differs')
    .option('--set <language>', 'set this language (or "undetermined") by hand for the answers of --rows')
    .option('--rows <ids>', 'row ids (comma-separated) for --set')
    .action(async (flags: LanguageFlags) => {
      const store = ctx.openStore();
      const study = requireStudy(store, flags.study);
      if (flags.acceptWritten !== undefined && flags.set !== undefined) throw new InputError('Use either --accept-written or --set, not both.');
      if (flags.acceptWritten !== undefined) {
        const rows = typeof flags.acceptWritten === 'string' ? list(flags.acceptWritten) : undefined;
        const changed = acceptWrittenLanguages(store, study.id, rows);
        ctx.out(`Took the written language for ${changed} answer${changed === 1 ? '' : 's'}${rows ? ` of ${rows.length} row${rows.length === 1 ? '' : 's'}` : ''}; the declared language stays stored.${changed > 0 ? ' The vocabulary was rebuilt.' : ''}`);
        return;
      }
      if (flags.set !== undefined) {
        const changed = setAnswerLanguages(store, study.id, list(flags.rows), flags.set, study.languages);
        ctx.out(`Set the language of ${changed} answer${changed === 1 ? '' : 's'} to ${flags.set}.${changed > 0 ? ' The vocabulary was rebuilt.' : ''}`);
        return;
      }
      if (flags.rows !== undefined) throw new InputError('--rows goes with --set (or give the rows to --accept-written directly).');
      const filter: DocumentFilter = {};
      if (flags.disagreements) filter.disagreements = true;
      if (flags.mixed) filter.mixed = true;
      if (flags.undetermined) filter.language = null;
      const rows = [...iterateDocuments(store, study.id, filter)].map((d) => [
        d.rowId,
        d.question,
        d.language ?? 'undetermined',
        d.languageSource,
        Math.round(d.confidence * 1000) / 1000,
        d.declaredLanguage ?? '',
        d.writtenLanguage ?? '',
        d.declaredCheck ?? '',
        d.mixedLanguage ?? '',
        d.mixedShare === null ? '' : Math.round(d.mixedShare * 1000) / 1000,
      ]);
      if (flags.out) {
        await writeFile(flags.out, csvBytes(HEADER, rows));
        ctx.err(`Wrote ${rows.length} rows to ${flags.out}.`);
      } else ctx.io.stdout.write(toCsv(HEADER, rows).replace(/\r\n/g, '\n'));
    });
}
