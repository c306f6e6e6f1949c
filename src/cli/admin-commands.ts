// users and serve.
import type { Command } from 'commander';
import { ensureDemoStudy } from '../services/index.js';
import { createAccount, giveOwnerlessStudiesToFirstAccount, MIN_PASSWORD_LENGTH } from '../store/index.js';
import { InputError } from '../text/types.js';
import { describeImport } from './study-commands.js';
import type { CliContext } from './context.js';

interface ServerModule {
  startServer(options: { host: string; port?: number; dataDir: string; demo: boolean }): Promise<{ url: string; close(): Promise<void> }>;
}

export function registerAdminCommands(program: Command, ctx: CliContext): void {
  const users = program.command('users').description('workbench accounts');
  users
    .command('add')
    .description('add an account; the password is read from standard input')
    .argument('<name>', 'account name')
    .option('--password-stdin', 'read the password from standard input (the default)')
    .action(async (name: string) => {
      const text = await ctx.io.readStdin();
      const password = text.split(/\r?\n/)[0] ?? '';
      // OWASP ASVS 4.0.3, requirement 2.1.1: at least 12 characters.
      if ([...password].length < MIN_PASSWORD_LENGTH) {
        throw new InputError(`Give a password of at least ${MIN_PASSWORD_LENGTH} characters on standard input, e.g. printf "%s\\n" "$PASSWORD" | themata users add NAME.`);
      }
      const store = ctx.openStore();
      try {
        const account = createAccount(store, name, password);
        ctx.out(`Added account "${account.name}".`);
      } catch (e) {
        throw new InputError((e as Error).message);
      }
      // Studies made before any account existed (command line, demo) belong to no one; without an
      // owner the workbench would show them to nobody.
      const given = giveOwnerlessStudiesToFirstAccount(store);
      if (given && given.studies.length) {
        ctx.out(`Gave ${given.studies.length} ${given.studies.length === 1 ? 'study' : 'studies'} without an owner to "${given.account.name}", the first account: ${given.studies.map((n) => `"${n}"`).join(', ')}.`);
      }
    });

  program
    .command('serve')
    .description('serve the workbench on this computer (http://127.0.0.1:4180 unless told otherwise)')
    .option('--host <host>', 'address to bind', '127.0.0.1')
    .option('--port <port>', 'port (default 4180)')
    .option('--demo', 'import the demo study into an empty data folder first')
    .action(async (flags: { host: string; port?: string; demo?: boolean }) => {
      const port = flags.port === undefined ? undefined : Number(flags.port);
      if (port !== undefined && (!Number.isInteger(port) || port < 0 || port > 65535)) throw new InputError(`--port needs a port number (got "${flags.port}").`);
      let server: ServerModule | undefined;
      try {
        server = (await import(new URL('../server/index.js', import.meta.url).href)) as ServerModule;
        if (typeof server.startServer !== 'function') server = undefined;
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code !== 'ERR_MODULE_NOT_FOUND') throw e;
      }
      if (flags.demo) {
        const outcome = await ensureDemoStudy(ctx.openStore());
        if (outcome.summary) for (const line of describeImport(outcome.summary)) ctx.out(line);
      }
      if (!server) {
        ctx.out(`The web workbench is not part of this build yet. Data folder: ${ctx.dataDir}. Use the command line meanwhile (themata --help).`);
        return;
      }
      ctx.close(); // the server opens its own store
      let running;
      try {
        running = await server.startServer({ host: flags.host, ...(port !== undefined ? { port } : {}), dataDir: ctx.dataDir, demo: !!flags.demo });
      } catch (e) {
        const code = (e as NodeJS.ErrnoException).code;
        if ((e as Error).name === 'ServerStartError') throw new InputError((e as Error).message);
        if (code === 'EADDRINUSE') throw new InputError(`Port ${port ?? 4180} is already in use; choose another with --port.`);
        if (code === 'EACCES' || code === 'EADDRNOTAVAIL') throw new InputError(`Cannot listen on ${flags.host}:${port ?? 4180} (${code}).`);
        throw e;
      }
      ctx.out(`Themata is serving at ${running.url} (data folder ${ctx.dataDir}). Press Ctrl+C to stop.`);
      const stop = () => void running.close().then(() => process.exit(0));
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
    });
}
