// import, languages, vocabulary (issue 2 item 6).
import { writeFile } from 'node:fs/promises';
import type { Command } from 'commander';
import { importFile, requireStudy, type ImportSummary } from '../services/index.js';
import { csvBytes, toCsv } from '../services/csv.js';
import { iterateDocuments, topWords, vocabularySizes } from '../store/index.js';
import { normalizeLanguageTag } from '../text/language-tags.js';
import { InputError } from '../text/types.js';
import { formatCounts, mappingFromFlags, mappingOptions, parseNumber, readInputFile, type CliContext, type MappingFlags } from './context.js';

export function describeImport(s: ImportSummary): string[] {
  const lines = [
    `Imported ${s.fileName} into study "${s.studyName}"${s.studyCreated ? ' (new study)' : ''}: ${s.rows} rows, ${s.documents} answers.`,
    `Read as ${s.format.toUpperCase()}, encoding assumed ${s.encoding}${s.encodingConfidence !== undefined ? ` (confidence ${Math.round(s.encodingConfidence * 100)}%)` : ''}${s.delimiter ? `, delimiter ${JSON.stringify(s.delimiter)}` : ''}${s.sheet ? `, sheet "${s.sheet}"` : ''}.`,
    `Answers per language: ${formatCounts(s.documentsPerLanguage)}.`,
    `Undetermined language: ${s.undetermined}.`,
    `Excluded: ${formatCounts(s.excluded)}.`,
    `Language decided by: ${formatCounts(s.languageSources)}.`,
    `Vocabulary of the study: ${Object.entries(s.vocabularySizes).map(([l, n]) => `${l} ${n} words`).join(', ') || 'empty'}.`,
  ];
  return lines;
}

export function registerStudyCommands(program: Command, ctx: CliContext): void {
  mappingOptions(
    program
      .command('import')
      .description('import a CSV, TSV, JSON Lines, XLSX or SPSS .sav file into a study (created if missing)')
      .argument('<file>', 'file to import')
      .requiredOption('--study <name>', 'study name'),
  )
    .option('--languages <list>', 'the study\'s languages, comma-separated (e.g. en,es,fr)')
    .option('--json', 'print the summary as one JSON line')
    .action(async (file: string, flags: MappingFlags & { study: string; languages?: string; sheet?: string; json?: boolean }) => {
      if (flags.text.length === 0) throw new InputError('Say which column holds the answers: --text COL (repeat for several questions).', file);
      const input = await readInputFile(file);
      const store = ctx.openStore();
      const bar = ctx.progressBar('{phase} |{bar}| {value}/{total}');
      let phase = '';
      const summary = await importFile(store, {
        study: flags.study,
        bytes: input.bytes,
        fileName: input.fileName,
        mapping: mappingFromFlags(flags),
        ...(flags.languages ? { languages: flags.languages.split(',') } : {}),
        ...(flags.sheet ? { sheet: flags.sheet } : {}),
        onProgress: (p) => {
          if (p.phase !== phase) {
            if (phase) bar.stop();
            phase = p.phase;
            if (p.phase !== 'done') bar.start(Math.max(1, p.total), p.done, { phase: p.phase.padEnd(10) });
          } else bar.update(p.done, { phase: p.phase.padEnd(10) });
        },
      });
      bar.stop();
      if (flags.json) ctx.out(JSON.stringify(summary));
      else for (const line of describeImport(summary)) ctx.out(line);
    });

  program
    .command('languages')
    .description('list every answer\'s language decision as CSV: id,question,language,source,confidence')
    .requiredOption('--study <name>', 'study name')
    .option('--out <file>', 'write the CSV to this file (UTF-8 with BOM) instead of standard output')
    .option('--disagreements', 'only answers whose declared language differs from the language written')
    .action(async (flags: { study: string; out?: string; disagreements?: boolean }) => {
      const store = ctx.openStore();
      const study = requireStudy(store, flags.study);
      const header = ['id', 'question', 'language', 'source', 'confidence'];
      const docs = iterateDocuments(store, study.id, flags.disagreements ? { disagreements: true } : {});
      const rows = [...docs].map((d) => [d.rowId, d.question, d.language ?? 'undetermined', d.languageSource, Math.round(d.confidence * 1000) / 1000]);
      if (flags.out) {
        await writeFile(flags.out, csvBytes(header, rows));
        ctx.err(`Wrote ${rows.length} rows to ${flags.out}.`);
      } else ctx.io.stdout.write(toCsv(header, rows).replace(/\r\n/g, '\n'));
    });

  program
    .command('vocabulary')
    .description('top words of one language in a study, with surface forms and counts')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--lang <xx>', 'language subtag, e.g. en')
    .option('--top <n>', 'how many words', '30')
    .action((flags: { study: string; lang: string; top: string }) => {
      const store = ctx.openStore();
      const study = requireStudy(store, flags.study);
      const sizes = vocabularySizes(store, study.id);
      const lang = normalizeLanguageTag(flags.lang) ?? flags.lang;
      const mine = sizes.find((s) => s.language === lang);
      if (!mine) throw new InputError(`Study "${study.name}" has no vocabulary for "${flags.lang}". Languages with words: ${sizes.map((s) => s.language).join(', ') || 'none'}.`);
      const top = parseNumber('--top', flags.top)!;
      ctx.out(`${lang}: ${mine.words} words, ${mine.tokens} tokens.`);
      ctx.out(['rank', 'word', 'stem', 'count', 'answers'].join('\t'));
      topWords(store, study.id, lang, { limit: top }).forEach((w, i) => ctx.out([i + 1, w.surface, w.stem, w.count, w.docCount].join('\t')));
    });
}
