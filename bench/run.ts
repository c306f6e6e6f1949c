// `npm run bench [-- --only NAME[,NAME]] [--quick] [--full] [--json]`
// Runs the benchmark sections and prints their figures. A benchmark, not a test: figures are
// printed as ratios measured side by side in one run, never asserted against wall-clock limits.
import { Command } from 'commander';

export interface BenchOptions {
  quick: boolean;
  full: boolean;
  json: boolean;
  /** Answers of the `--full` case (default 1,000,000; try 20,000 to check it works). */
  answers: number;
  /** Write human-readable lines here (stderr when --json so stdout ends with the JSON line). */
  log: (line: string) => void;
}

type Section = (options: BenchOptions) => Promise<Record<string, unknown>>;

const sections: Record<string, () => Promise<Section>> = {
  import: async () => (await import('./import.js')).runBench,
  sampler: async () => (await import('./sampler.js')).runBench,
  web: async () => (await import('./web.js')).runBench,
  load: async () => (await import('./load.js')).runBench,
  alignment: async () => (await import('./alignment.js')).runBench,
};

const program = new Command()
  .name('bench')
  .option('--only <names>', `comma-separated sections: ${Object.keys(sections).join(', ')}`)
  .option('--quick', 'a smaller run (under two minutes)', false)
  .option('--full', 'add the end-to-end million-answer case', false)
  .option('--json', 'print one JSON object with every figure on the last line', false)
  .option('--answers <n>', 'answers of the --full case', '1000000')
  .parse(process.argv);

const opts = program.opts<{ only?: string; quick: boolean; full: boolean; json: boolean; answers: string }>();
const answers = Number(opts.answers);
if (!Number.isInteger(answers) || answers < 1000) {
  console.error(`--answers must be a whole number of at least 1000 (got "${opts.answers}").`);
  process.exit(2);
}
const chosen = opts.only ? opts.only.split(',').map((s) => s.trim()) : ['sampler', 'import'];
const unknown = chosen.filter((name) => !(name in sections));
if (unknown.length > 0) {
  console.error(`Unknown benchmark section(s): ${unknown.join(', ')}. Known: ${Object.keys(sections).join(', ')}.`);
  process.exit(2);
}
const log = opts.json ? (line: string) => console.error(line) : (line: string) => console.log(line);
const results: Record<string, unknown> = {};
for (const name of chosen) {
  log(`\n== ${name} ==`);
  const run = await sections[name]();
  results[name] = await run({ quick: opts.quick, full: opts.full, json: opts.json, answers, log });
}
if (opts.json) {
  // With a single section, its figures are the top-level object (the sampler section's keys are
  // named in issue #5: k, floor, reference, fast1, …).
  console.log(JSON.stringify(chosen.length === 1 ? results[chosen[0]] : results));
}
