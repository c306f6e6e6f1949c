// users and serve.
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import { ensureDemoStudy } from '../services/index.js';
import { describeScanning, scannerFromSetting, type UploadScanner } from '../platform/index.js';
import { createAccount, getAccountByName, giveOwnerlessStudiesToFirstAccount, passwordProblem, setPassword } from '../store/index.js';
import { InputError } from '../text/index.js';
import { describeImport } from './study-commands.js';
import type { CliContext } from './context.js';

/**
 * The workbench as the command line sees it: given by the composition root (src/main.ts), so the
 * command line never imports the server (test/architecture/layers.test.ts).
 */
export interface WorkbenchServer {
  start(options: {
    host: string;
    port?: number;
    dataDir: string;
    demo: boolean;
    secureCookies?: boolean;
    tls?: TlsFlagFiles;
    allowedHosts?: readonly string[];
    /** Requests a second per account or address (the server turns it into its limits). */
    requestsPerSecond?: number;
    uploadScanner?: UploadScanner;
  }): Promise<{ url: string; certificateValidTo?: Date; close(): Promise<void> }>;
}

interface ServeFlags {
  host: string;
  port?: string;
  demo?: boolean;
  secureCookies?: boolean;
  tlsCert?: string;
  tlsKey?: string;
  allowedHosts?: string;
  requestsPerSecond?: string;
  scanCommand?: string;
}

/** What `--tls-cert` and `--tls-key` name, read (the server's `TlsFiles`). */
interface TlsFlagFiles {
  cert: Buffer;
  key: Buffer;
  certFile: string;
  keyFile: string;
}

export function registerAdminCommands(program: Command, ctx: CliContext): void {
  const users = program.command('users').description('workbench accounts');
  users
    .command('add')
    .description('add an account; the password is read from standard input')
    .argument('<name>', 'account name')
    .option('--password-stdin', 'read the password from standard input (the default)')
    .action(async (name: string) => {
      const password = await passwordFromStdin(ctx, `printf "%s\\n" "$PASSWORD" | themata users add NAME`);
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
  users
    .command('password')
    .description("set an account's new password, read from standard input, and sign the account out everywhere")
    .argument('<name>', 'account name')
    .option('--password-stdin', 'read the password from standard input (the default)')
    .action(async (name: string) => {
      const password = await passwordFromStdin(ctx, `printf "%s\\n" "$PASSWORD" | themata users password NAME`);
      const store = ctx.openStore();
      const account = getAccountByName(store, name);
      if (!account) throw new InputError(`There is no account named "${name.trim()}". Add it with themata users add NAME.`);
      let ended: number;
      try {
        ended = setPassword(store, account.id, password);
      } catch (e) {
        throw new InputError((e as Error).message);
      }
      ctx.out(`Changed the password of "${account.name}"; ${ended === 1 ? '1 session was' : `${ended} sessions were`} signed out.`);
      // OWASP ASVS 4.0.3 V2.2.3, V2.5.5: the workbench tells the account at its next sign-in.
      ctx.out('The account will be told of this change, made by the server\'s operator, when it next signs in to the workbench.');
    });

  program
    .command('serve')
    .description('serve the workbench on this computer (http://127.0.0.1:4180 unless told otherwise)')
    .option('--host <host>', 'address to bind', '127.0.0.1')
    .option('--port <port>', 'port (default 4180)')
    .option('--demo', 'import the demo study into an empty data folder first')
    .option(
      '--secure-cookies',
      'behind a TLS proxy: send the session cookie over HTTPS only, as __Host-themata_session (overrides THEMATA_SECURE_COOKIES)',
    )
    .option('--no-secure-cookies', 'send the session cookie over plain HTTP too, whatever THEMATA_SECURE_COOKIES says')
    .option(
      '--tls-cert <file>',
      'serve HTTPS (TLS 1.2 and 1.3) with this PEM certificate, followed by any intermediate certificates; needs --tls-key, and turns on the secure cookie',
    )
    .option('--tls-key <file>', 'the unencrypted PEM private key of --tls-cert (keep the file readable by the server\'s user only)')
    .option(
      '--allowed-hosts <names>',
      'host names the server answers to besides its own, separated by commas, e.g. the name a TLS proxy passes on (overrides THEMATA_ALLOWED_HOSTS)',
    )
    .option('--requests-per-second <n>', 'requests a second each account (or address, when not signed in) may make; bursts of six seconds\' worth, form posts a quarter (default 20)')
    .option('--scan-command <command>', 'virus scanner each upload is piped to before it is read, e.g. "clamdscan --no-summary --fdpass -"; exit 0 clean, 1 infected (overrides THEMATA_SCAN_COMMAND)')
    .addHelpText(
      'after',
      `
Behind a TLS proxy that forwards https://themata.lab.example.org:
  themata serve --host 127.0.0.1 --secure-cookies --allowed-hosts themata.lab.example.org
Without a proxy, serving HTTPS itself (renew the certificate yourself; Themata does not):
  themata serve --host 0.0.0.0 --port 443 --tls-cert /etc/themata/cert.pem --tls-key /etc/themata/key.pem`,
    )
    .action(async (flags: ServeFlags) => {
      const port = flags.port === undefined ? undefined : Number(flags.port);
      if (port !== undefined && (!Number.isInteger(port) || port < 0 || port > 65535)) throw new InputError(`--port needs a port number (got "${flags.port}").`);
      const allowedHosts = flags.allowedHosts === undefined ? undefined : flags.allowedHosts.split(',').map((x) => x.trim()).filter(Boolean);
      const rate = flags.requestsPerSecond === undefined ? undefined : Number(flags.requestsPerSecond);
      if (rate !== undefined && !(Number.isFinite(rate) && rate >= 1)) {
        throw new InputError(`--requests-per-second needs a number of at least 1 (got "${flags.requestsPerSecond}").`);
      }
      const tls = readTlsFlags(flags);
      const scanner = scannerFromSetting(flags.scanCommand, process.env);
      const server = ctx.deps.server;
      if (flags.demo) {
        const outcome = await ensureDemoStudy(ctx.openStore());
        if (outcome.summary) for (const line of describeImport(outcome.summary)) ctx.out(line);
      }
      if (!server) {
        ctx.out(`The web workbench is not part of this command. Data folder: ${ctx.dataDir}. Use the command line meanwhile (themata --help).`);
        return;
      }
      ctx.close(); // the server opens its own store
      let running;
      try {
        // A flag wins over its environment variable; without the flag startServer reads the variable.
        running = await server.start({
          host: flags.host,
          ...(port !== undefined ? { port } : {}),
          dataDir: ctx.dataDir,
          demo: !!flags.demo,
          ...(flags.secureCookies !== undefined ? { secureCookies: flags.secureCookies } : {}),
          ...(tls !== undefined ? { tls } : {}),
          ...(allowedHosts !== undefined ? { allowedHosts } : {}),
          ...(rate !== undefined ? { requestsPerSecond: rate } : {}),
          ...(scanner !== undefined ? { uploadScanner: scanner } : {}),
        });
      } catch (e) {
        const code = (e as NodeJS.ErrnoException).code;
        if ((e as Error).name === 'ServerStartError') throw new InputError((e as Error).message);
        if (code === 'EADDRINUSE') throw new InputError(`Port ${port ?? 4180} is already in use; choose another with --port.`);
        if (code === 'EACCES' || code === 'EADDRNOTAVAIL') throw new InputError(`Cannot listen on ${flags.host}:${port ?? 4180} (${code}).`);
        throw e;
      }
      ctx.out(`Themata is serving at ${running.url} (data folder ${ctx.dataDir}). Press Ctrl+C to stop.`);
      if (running.certificateValidTo) {
        ctx.out(
          `The TLS certificate is valid until ${running.certificateValidTo.toISOString().slice(0, 10)}. ` +
            'Themata does not renew it: put a new certificate in place and restart before then.',
        );
      }
      ctx.out(describeScanning(scanner));
      const stop = () => void running.close().then(() => process.exit(0));
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
    });
}

/**
 * `--tls-cert` and `--tls-key`: both or neither, each a file this process can read. The paths are
 * the operator's, from the command line; what the files hold is checked by the server
 * (`checkTlsFiles`) before it listens.
 */
function readTlsFlags(flags: ServeFlags): TlsFlagFiles | undefined {
  if (flags.tlsCert === undefined && flags.tlsKey === undefined) return undefined;
  if (flags.tlsKey === undefined) {
    throw new InputError('--tls-cert needs --tls-key as well: give both the certificate file and its private key file (PEM), or neither to serve plain HTTP.');
  }
  if (flags.tlsCert === undefined) {
    throw new InputError('--tls-key needs --tls-cert as well: give both the certificate file and its private key file (PEM), or neither to serve plain HTTP.');
  }
  if (flags.secureCookies === false) {
    throw new InputError('--no-secure-cookies cannot be used with --tls-cert: over HTTPS the session cookie is always Secure.');
  }
  return {
    cert: readFlagFile(flags.tlsCert, 'TLS certificate', '--tls-cert'),
    key: readFlagFile(flags.tlsKey, 'TLS key', '--tls-key'),
    certFile: flags.tlsCert,
    keyFile: flags.tlsKey,
  };
}

function readFlagFile(file: string, what: string, flag: string): Buffer {
  try {
    return readFileSync(file);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'there is no such file' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code === 'EISDIR' ? 'it is a folder' : (code ?? 'unreadable');
    throw new InputError(`Cannot read the ${what} file "${file}" given with ${flag} (${why}).`);
  }
}

/**
 * The first line of standard input, checked against the password rules (OWASP ASVS 4.0.3 V2.1.1,
 * V2.1.2, V2.1.7: 12 to 128 characters, not a common password) before anything is opened.
 */
async function passwordFromStdin(ctx: CliContext, example: string): Promise<string> {
  const text = await ctx.io.readStdin();
  const password = text.split(/\r?\n/)[0] ?? '';
  const problem = passwordProblem(password);
  if (problem) {
    throw new InputError(password ? `${problem} The password is read from standard input.` : `Give the password on standard input, e.g. ${example}. ${problem}`);
  }
  return password;
}
