// Runs the command line in-process with captured output.
import { Writable } from 'node:stream';
import { runCli } from '../../src/cli/index.js';
import { startWorkbench } from '../../src/server/index.js';

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

export async function cli(args: string[], stdin = ''): Promise<CliResult> {
  let stdout = '';
  let stderr = '';
  const err = new Writable({
    write(chunk, _enc, done) {
      stderr += String(chunk);
      done();
    },
  });
  const code = await runCli(args, {
    stdout: { write: (s: string) => (stdout += s) },
    stderr: err,
    readStdin: async () => stdin,
  }, { server: { start: startWorkbench } });
  return { code, stdout, stderr };
}
