// import, languages (language-commands.ts), vocabulary (issue 2 item 6); remove-study and remove-import (OWASP ASVS 4.0.3 V8.3.2).
import type { Command } from 'commander';
import { describeStudyContents, formatBytes, importFile, planImportRemoval, planStudyRemoval, removeImport, removeStudy, requireStudy, type ImportSummary, type RemovalOutcome } from '../services/index.js';
import { scannerFromSetting, scanUpload } from '../platform/index.js';
import { listImports, topWords, vacuumStore, vocabularySizes, type Store } from '../store/index.js';
import { normalizeLanguageTag } from '../text/index.js';
import { InputError } from '../text/index.js';
import { registerLanguageCommand } from './language-commands.js';
import { formatCounts, mappingFromFlags, mappingOptions, parseNumber, readInputFile, type CliContext, type MappingFlags } from './context.js';

export function describeImport(s: ImportSummary): string[] {
  const lines = [
    `Imported ${s.fileName} into study "${s.studyName}"${s.studyCreated ? ' (new study)' : ''}: ${s.rows} rows, ${s.documents} answers.`,
    `Read as ${s.format.toUpperCase()}, encoding assumed ${s.encoding}${s.encodingConfidence !== undefined ? ` (confidence ${Math.round(s.encodingConfidence * 100)}%)` : ''}${s.delimiter ? `, delimiter ${JSON.stringify(s.delimiter)}` : ''}${s.sheet ? `, sheet "${s.sheet}"` : ''}.`,
    ...(s.encodingNotes ?? []).map((n) => `Warning: ${n.message}`),
    `Answers per language: ${formatCounts(s.documentsPerLanguage)}.`,
    `Undetermined language: ${s.undetermined}.`,
    ...(Object.keys(s.declaredChecks ?? {}).length > 0
      ? [`Declared language: ${formatCounts(s.declaredChecks)} (overruled = the text is clearly in another language, which was taken; see \`themata languages --disagreements\`).`]
      : []),
    ...(s.mixedAnswers ? [`Answers written in two languages (decided by the language of most of their words): ${s.mixedAnswers}.`] : []),
    `Excluded: ${formatCounts(s.excluded)}.`,
    `Language decided by: ${formatCounts(s.languageSources)}.`,
    `Vocabulary of the study: ${Object.entries(s.vocabularySizes).map(([l, n]) => `${l} ${n} words`).join(', ') || 'empty'}.`,
  ];
  return lines;
}

/** The two options every remove-* command takes: --yes to delete, --vacuum to rewrite the file after. */
export function removalOptions(command: Command): Command {
  return command
    .option('--yes', 'really delete')
    .option('--vacuum', 'afterwards rewrite the data file so no free page keeps deleted bytes');
}

/** After a deletion: say what went; with --vacuum rewrite the data file so no free page keeps old bytes. */
export function reportRemoval(ctx: CliContext, store: Store, outcome: RemovalOutcome, vacuum: boolean | undefined): void {
  ctx.out(outcome.message);
  if (vacuum) {
    vacuumStore(store);
    ctx.out('The data file was rewritten (VACUUM): no free page holds deleted data.');
  } else if (!outcome.walTruncated) {
    ctx.err('Another program had the data file open; its journal keeps old pages until its next checkpoint.');
  }
}

/** An import of the study by id or file name; InputError listing the study's files otherwise. */
function requireImport(store: Store, studyId: number, studyName: string, which: string): number {
  const imports = listImports(store, studyId);
  const byId = /^\d+$/.test(which) ? imports.find((i) => i.id === Number(which)) : undefined;
  const byName = imports.filter((i) => i.fileName === which);
  if (byId) return byId.id;
  if (byName.length === 1) return byName[0].id;
  const list = imports.map((i) => `${i.id} ${i.fileName} (${i.documents} answers)`).join('; ') || 'none';
  if (byName.length > 1) throw new InputError(`Study "${studyName}" has ${byName.length} files called "${which}"; name one by its number: ${list}.`);
  throw new InputError(`Study "${studyName}" has no imported file "${which}". Its files (number, name): ${list}.`);
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
    .option('--trust-declared', 'the declared language column always wins (default: it is a strong prior, and a text clearly written in another language gets that language)')
    .option('--scan-command <command>', 'virus scanner the file is piped to before it is read, e.g. "clamscan --no-summary -"; exit 0 clean, 1 infected (overrides THEMATA_SCAN_COMMAND)')
    .action(async (file: string, flags: MappingFlags & { study: string; languages?: string; sheet?: string; json?: boolean; trustDeclared?: boolean; scanCommand?: string }) => {
      if (flags.text.length === 0) throw new InputError('Say which column holds the answers: --text COL (repeat for several questions).', file);
      const input = await readInputFile(file);
      // Scanned before anything reads or stores the bytes (OWASP ASVS 4.0.3 V12.4.2).
      await scanUpload(scannerFromSetting(flags.scanCommand, process.env), input.bytes, input.fileName);
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
        ...(flags.trustDeclared ? { trustDeclared: true } : {}),
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

  registerLanguageCommand(program, ctx);

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

  removalOptions(
    program
      .command('remove-study')
      .description('delete a study with its files, answers, vocabulary, runs, results and memberships (without --yes: only say what would go)')
      .requiredOption('--study <name>', 'study name')
  )
    .action(async (flags: { study: string; yes?: boolean; vacuum?: boolean }) => {
      const store = ctx.openStore();
      const study = requireStudy(store, flags.study);
      const plan = planStudyRemoval(store, study.id);
      if (plan.refusal) throw new InputError(plan.refusal);
      if (!flags.yes) {
        ctx.out(`Would delete study "${study.name}": ${describeStudyContents(plan.contents)}.`);
        if (plan.stopping.length) ctx.out(`Queued runs cancelled with it: ${plan.stopping.join(', ')}.`);
        ctx.out('Nothing was deleted. Add --yes to delete.');
        return;
      }
      reportRemoval(ctx, store, await removeStudy(store, study.id), flags.vacuum);
    });

  removalOptions(
    program
      .command('remove-import')
      .description('delete one imported file and its answers from a study, refused while a run was fitted on them (without --yes: only say what would go)')
      .requiredOption('--study <name>', 'study name')
      .requiredOption('--import <file>', 'file name as imported, or its number')
  )
    .action(async (flags: { study: string; import: string; yes?: boolean; vacuum?: boolean }) => {
      const store = ctx.openStore();
      const study = requireStudy(store, flags.study);
      const plan = planImportRemoval(store, requireImport(store, study.id, study.name, flags.import));
      if (plan.refusal) throw new InputError(plan.refusal);
      if (!flags.yes) {
        ctx.out(`Would delete ${plan.record.fileName} (number ${plan.record.id}) from study "${study.name}": the original file (${formatBytes(plan.record.size)}) and ${plan.record.documents} answers; the vocabulary is rebuilt without them.`);
        ctx.out('Nothing was deleted. Add --yes to delete.');
        return;
      }
      reportRemoval(ctx, store, await removeImport(store, plan.record.id), flags.vacuum);
    });
}
