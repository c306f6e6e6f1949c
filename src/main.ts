// Entry of the `themata` command (bin/themata.mjs registers tsx and imports this file).
import { runCli } from './cli/index.js';

async function readStdin(): Promise<string> {
  if (process.stdin.isTTY) return '';
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8');
}

const code = await runCli(process.argv.slice(2), { stdout: process.stdout, stderr: process.stderr, readStdin });
// `serve` keeps the process alive through its listening socket; every other command ends here.
if (code !== 0 || !process.argv.slice(2).includes('serve')) process.exitCode = code;
