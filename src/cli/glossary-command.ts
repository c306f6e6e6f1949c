// `themata glossary`: import a researcher's term list (one row per concept, one column per
// language of the study) as link groups of tiny documents (docs/design.md §3), or list a study's glossaries.
import type { Command } from 'commander';
import { importGlossary, listGlossaries, requireStudy, type GlossarySummary } from '../services/index.js';
import { scannerFromSetting, scanUpload } from '../platform/index.js';
import { readInputFile, type CliContext } from './context.js';

function languageCounts(columns: readonly { language: string }[], counts: Record<string, number>): string {
  return columns.map((c) => `${c.language} ${counts[c.language] ?? 0}`).join(', ');
}

export function describeGlossary(s: GlossarySummary): string[] {
  const lines = [
    `Imported glossary ${s.fileName} into study "${s.studyName}" (number ${s.importId}): ${s.rows} rows, ${s.linkGroups} link groups, ${s.linkingRows} of them with words in at least two languages of the vocabulary.`,
    `Columns: ${s.columns.map((c) => (c.column === c.language ? c.column : `${c.column} = ${c.language}`)).join(', ')}.`,
    `Terms per language: ${languageCounts(s.columns, s.termsPerLanguage)}.`,
    `Rows per language with words in the vocabulary: ${languageCounts(s.columns, s.withWordsPerLanguage)} (of ${languageCounts(s.columns, s.documentsPerLanguage)}).`,
  ];
  if (s.singleLanguageRows.length) {
    const shown = s.singleLanguageRows.slice(0, 10).join(', ');
    lines.push(`Left out ${s.singleLanguageRows.length} rows with terms in one language only (data rows ${shown}${s.singleLanguageRows.length > 10 ? ', …' : ''}): a row links nothing without a second language.`);
  }
  return lines;
}

export function registerGlossaryCommand(program: Command, ctx: CliContext): void {
  program
    .command('glossary')
    .description('import a glossary (CSV, TSV or XLSX: one row per concept, one column per language of the study; synonyms separated by ";" or "/") as link groups; without a file, list the study\'s glossaries')
    .argument('[file]', 'glossary file to import')
    .requiredOption('--study <name>', 'study name (the study must exist: import its answers first)')
    .option('--sheet <name>', 'XLSX: the sheet to read (default: the first)')
    .option('--json', 'print the summary as one JSON line')
    .option('--scan-command <command>', 'virus scanner the file is piped to before it is read (overrides THEMATA_SCAN_COMMAND)')
    .action(async (file: string | undefined, flags: { study: string; sheet?: string; json?: boolean; scanCommand?: string }) => {
      const store = ctx.openStore();
      if (file === undefined) {
        const study = requireStudy(store, flags.study);
        const list = listGlossaries(store, study.id);
        if (flags.json) return ctx.out(JSON.stringify(list));
        if (list.length === 0) return ctx.out(`Study "${study.name}" has no glossary. Import one with: themata glossary --study "${study.name}" FILE`);
        for (const g of list) ctx.out(`${g.importId} ${g.fileName}: ${g.rows} rows, ${g.linkingRows} linking two or more languages; terms ${languageCounts(g.columns, g.termsPerLanguage)}.`);
        return;
      }
      const input = await readInputFile(file);
      // Scanned before anything reads or stores the bytes (OWASP ASVS 4.0.3 V12.4.2).
      await scanUpload(scannerFromSetting(flags.scanCommand, process.env), input.bytes, input.fileName);
      const summary = await importGlossary(store, { study: flags.study, bytes: input.bytes, fileName: input.fileName, ...(flags.sheet ? { sheet: flags.sheet } : {}) });
      if (flags.json) ctx.out(JSON.stringify(summary));
      else for (const line of describeGlossary(summary)) ctx.out(line);
    });
}
