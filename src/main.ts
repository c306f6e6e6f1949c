// The composition root of the `themata` command (bin/themata.mjs registers tsx and imports this
// file): it connects the command line to the real process and hands it the workbench server for
// `serve`. Only this file knows both; the command line and the server never import each other
// (test/architecture/layers.test.ts).
import { runCli } from './cli/index.js';
import { startWorkbench } from './server/index.js';

async function readStdin(): Promise<string> {
  if (process.stdin.isTTY) return '';
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

const code = await runCli(process.argv.slice(2), { stdout: process.stdout, stderr: process.stderr, readStdin }, { server: { start: startWorkbench } });
// `serve` keeps the process alive through its listening socket; every other command ends here.
if (code !== 0 || !process.argv.slice(2).includes('serve')) process.exitCode = code;
