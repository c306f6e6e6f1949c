// The `themata` command line (docs/design.md §9): same core calls as the workbench. `runCli` runs one
// invocation in-process with its own output streams, so tests can drive it without a child
// process; src/main.ts (the composition root) connects it to the real process and the workbench.
import { Command, CommanderError } from 'commander';
import { InputError } from '../text/index.js';
import { registerAdminCommands } from './admin-commands.js';
import { registerCheckCommands } from './check-commands.js';
import { registerGlossaryCommand } from './glossary-command.js';
import { CliContext, type CliDeps, type CliIo } from './context.js';
import { registerRunCommands } from './run-commands.js';
import { registerStudyCommands } from './study-commands.js';

export type { CliDeps, CliIo } from './context.js';
export type { WorkbenchServer } from './admin-commands.js';

/** Exit codes: 0 done, 1 unexpected failure, 2 a problem with the input or the command line. */
export const EXIT_INPUT = 2;

export function describeInputError(e: InputError): string {
  const lower = e.message.toLowerCase();
  const where = [
    e.file && !e.message.includes(e.file) && `file ${e.file}`,
    e.row !== undefined && !lower.includes(`row ${e.row}`) && !lower.includes(`line ${e.row}`) && `row ${e.row}`,
    e.column && !e.message.includes(e.column) && `column "${e.column}"`,
  ].filter(Boolean);
  return where.length ? `${e.message} (${where.join(', ')})` : e.message;
}

export function buildProgram(ctx: CliContext): Command {
  const program = new Command()
    .name('themata')
    .description('Find themes in free-text answers written in several languages and compare them across groups.')
    .option('--data <dir>', 'data folder (holds themata.sqlite)', process.env.THEMATA_DATA ?? './data')
    .showHelpAfterError('(run with --help for usage)')
    .addHelpText(
      'after',
      `
Examples:
  themata import answers.csv --study "Wave 1" --text answer --id id --lang language --covariate region --weight weight
  themata fit --study "Wave 1" --themes 12 --covariate region --holdout 0.1 --name k12
  themata export --study "Wave 1" --run k12 --out results/
  themata apply --study "Wave 1" --run k12 wave2.csv --out wave2-coded.csv
  themata serve --demo

Exit codes: 0 done, 2 a problem with the input or the command line (one line on stderr), 1 anything else.`,
    )
    .exitOverride()
    .configureOutput({ writeOut: (s) => ctx.io.stdout.write(s), writeErr: (s) => ctx.io.stderr.write(s) });
  registerStudyCommands(program, ctx);
  registerGlossaryCommand(program, ctx);
  registerRunCommands(program, ctx);
  registerCheckCommands(program, ctx);
  registerAdminCommands(program, ctx);
  for (const cmd of program.commands) {
    cmd.exitOverride();
    cmd.configureOutput({ writeOut: (s) => ctx.io.stdout.write(s), writeErr: (s) => ctx.io.stderr.write(s) });
  }
  return program;
}

/** Run one command line (arguments after the program name); resolves to the exit code. */
export async function runCli(args: readonly string[], io: CliIo, deps: CliDeps = {}): Promise<number> {
  let program: Command | undefined;
  const ctx = new CliContext(io, () => program!.opts<{ data: string }>().data, deps);
  program = buildProgram(ctx);
  try {
    await program.parseAsync([...args], { from: 'user' });
    return 0;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version') return 0;
      return e.exitCode === 0 ? 0 : EXIT_INPUT;
    }
    if (e instanceof InputError) {
      io.stderr.write(`themata: ${describeInputError(e)}\n`);
      return EXIT_INPUT;
    }
    io.stderr.write(`themata: ${e instanceof Error ? e.message : String(e)}\n`);
    if (process.env.THEMATA_DEBUG && e instanceof Error && e.stack) io.stderr.write(`${e.stack}\n`);
    return 1;
  } finally {
    ctx.close();
  }
}
