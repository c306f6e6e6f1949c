// node --import tsx demo/generate.ts [--answers N] [--seed S] [--out DIR] [--xlsx]
// Writes library-survey.csv, truth.json and (with --xlsx) library-survey.xlsx. The same seed and
// size give the same bytes. Big sizes stream: rows are written as they are generated.
import { closeSync, mkdirSync, openSync, writeFileSync, writeSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Command } from 'commander';
import { csvHeader, csvLine, UTF8_BOM } from './csv.js';
import { DEFAULT_ANSWERS, DEFAULT_SEED, demoItems, PER_ROW_TRUTH_LIMIT, TruthSummary, truthHead, type DemoOptions } from './generator.js';
import { demoTruthJson } from './truth-json.js';
import { demoXlsx } from './xlsx.js';
import type { DemoRow, RowTruth } from './types.js';
import { DEMO_FILE_NAMES } from './index.js';

export { generateDemo } from './generator.js';

/** XLSX is only written up to this size (exceljs builds the workbook in memory). */
export const XLSX_ROW_LIMIT = 100_000;
/** Folder of the committed demo files. */
export const DEMO_DIR = fileURLToPath(new URL('.', import.meta.url));

export interface WriteResult {
  files: string[];
  rows: number;
  skipped: string[];
}

/** Generates and writes the demo files into `dir`, streaming the CSV. */
export async function writeDemoFiles(dir: string, options: DemoOptions, withXlsx: boolean): Promise<WriteResult> {
  mkdirSync(dir, { recursive: true });
  const keepRows = withXlsx && options.answers <= XLSX_ROW_LIMIT;
  const keepTruth = options.answers <= PER_ROW_TRUTH_LIMIT;
  const rows: DemoRow[] = [];
  const truthRows: RowTruth[] = [];
  const summary = new TruthSummary();
  const csvPath = join(dir, DEMO_FILE_NAMES.csv);
  const fd = openSync(csvPath, 'w');
  let chunk = UTF8_BOM + csvHeader();
  try {
    for (const item of demoItems(options)) {
      chunk += csvLine(item.row);
      if (chunk.length > 1 << 20) {
        writeSync(fd, chunk);
        chunk = '';
      }
      summary.add(item);
      if (keepRows) rows.push(item.row);
      if (keepTruth) truthRows.push(item.truth);
    }
    writeSync(fd, chunk);
  } finally {
    closeSync(fd);
  }
  const files = [csvPath];
  const skipped: string[] = [];
  const truthPath = join(dir, DEMO_FILE_NAMES.truth);
  writeFileSync(truthPath, demoTruthJson({ ...truthHead(options, summary), rows: keepTruth ? truthRows : null }));
  files.push(truthPath);
  if (!keepTruth) skipped.push(`per-answer detail in ${DEMO_FILE_NAMES.truth} (more than ${PER_ROW_TRUTH_LIMIT} answers; the summary is kept)`);
  if (withXlsx && keepRows) {
    const xlsxPath = join(dir, DEMO_FILE_NAMES.xlsx);
    writeFileSync(xlsxPath, await demoXlsx(rows));
    files.push(xlsxPath);
  } else if (withXlsx) {
    skipped.push(`${DEMO_FILE_NAMES.xlsx} (more than ${XLSX_ROW_LIMIT} answers)`);
  }
  return { files, rows: summary.counts.rows, skipped };
}

function wholeNumber(name: string, min: number, max: number) {
  return (value: string): number => {
    const n = Number(value);
    if (!Number.isInteger(n) || n < min || n > max) {
      console.error(`${name} must be a whole number from ${min} to ${max}; got "${value}".`);
      process.exit(2);
    }
    return n;
  };
}

async function main(argv: string[]): Promise<void> {
  const opts = new Command()
    .name('demo/generate.ts')
    .description('Write the invented library survey demo study and its planted truth.')
    .option('--answers <n>', 'number of rows (answers and translations)', wholeNumber('--answers', 1, 50_000_000), DEFAULT_ANSWERS)
    .option('--seed <s>', 'random seed', wholeNumber('--seed', 0, 0xffffffff), DEFAULT_SEED)
    .option('--out <dir>', 'output folder', DEMO_DIR)
    .option('--xlsx', 'also write library-survey.xlsx', false)
    .parse(argv)
    .opts<{ answers: number; seed: number; out: string; xlsx: boolean }>();
  const started = performance.now();
  const result = await writeDemoFiles(resolve(opts.out), { answers: opts.answers, seed: opts.seed }, opts.xlsx);
  const seconds = ((performance.now() - started) / 1000).toFixed(1);
  console.log(`Wrote ${result.rows} rows in ${seconds} s:`);
  for (const f of result.files) console.log(`  ${f}`);
  for (const s of result.skipped) console.log(`  skipped: ${s}`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  await main(process.argv);
}
