// Optional virus scan of uploaded bytes (OWASP ASVS 4.0.3 V12.4.2) by a scanner the operator
// names, e.g. ClamAV's `clamdscan --no-summary --fdpass -` or `clamscan --no-summary -`. Themata
// ships no scanner. The bytes go to the scanner's standard input: no file is written, and the
// user's file name is never a path or an argument. Exit code 0 is clean, 1 is infected (ClamAV's
// convention); anything else, a start failure or a timeout refuses the upload (fail closed).
import { spawn } from 'node:child_process';
import { InputError } from '../text/index.js';

export interface UploadScanner {
  /** Program and arguments, e.g. ['clamdscan', '--no-summary', '--fdpass', '-']. */
  readonly command: readonly string[];
  /** Time allowed for one scan (default 60 s, common practice for on-demand scanners). */
  readonly timeoutMs?: number;
  /** Scanner output kept, in bytes (default 64 KiB); the rest is read and dropped. */
  readonly maxOutputBytes?: number;
  /** Where a failed scan's detail goes (the server console by default); never file contents. */
  readonly log?: (line: string) => void;
}

export const SCAN_TIMEOUT_MS = 60_000;
const MAX_OUTPUT_BYTES = 64 * 1024;
const REPORT_CHARS = 200;
export const SCAN_INCOMPLETE = 'The virus scan could not be completed, so the file was not accepted. Try again later or ask the administrator of this workbench.';

/**
 * The setting (`--scan-command` or THEMATA_SCAN_COMMAND) as an argument array: split on white
 * space; double quotes keep spaces in one argument ("C:\\Program Files\\scan.exe"), `\"` inside
 * quotes is a literal quote. No shell is involved, so nothing else is special.
 */
export function parseScanCommand(setting: string): string[] {
  const args: string[] = [];
  let current = '';
  let started = false;
  let quoted = false;
  for (let i = 0; i < setting.length; i++) {
    const ch = setting[i];
    if (quoted) {
      if (ch === '\\' && setting[i + 1] === '"') current += setting[++i];
      else if (ch === '"') quoted = false;
      else current += ch;
    } else if (ch === '"') {
      quoted = true;
      started = true;
    } else if (/\s/.test(ch)) {
      if (started) args.push(current);
      current = '';
      started = false;
    } else {
      current += ch;
      started = true;
    }
  }
  if (quoted) throw new InputError(`The scan command has an unmatched double quote: ${setting}`);
  if (started) args.push(current);
  return args;
}

/** The scanner a flag or THEMATA_SCAN_COMMAND names (the flag wins); undefined when neither is set. */
export function scannerFromSetting(flag: string | undefined, env: Record<string, string | undefined>): UploadScanner | undefined {
  const setting = flag ?? env.THEMATA_SCAN_COMMAND;
  if (setting === undefined || setting.trim() === '') return undefined;
  const command = parseScanCommand(setting);
  if (command.length === 0) return undefined;
  return { command };
}

/** One line for people: whether uploads are scanned. */
export function describeScanning(scanner: UploadScanner | undefined): string {
  return scanner
    ? `Uploads are checked for viruses by ${scanner.command[0]} before they are read.`
    : 'Uploads are not checked for viruses on this workbench (no scanner is configured).';
}

function firstLine(text: string): string {
  // Control characters would let a scanner's output forge log lines or page text.
  const line = text.split(/\r?\n/).map((l) => l.replace(/[\u0000-\u001f\u007f]/g, ' ').trim()).find((l) => l !== '') ?? '';
  return line.length > REPORT_CHARS ? `${line.slice(0, REPORT_CHARS - 1)}…` : line;
}

interface ScanOutcome {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
  failure?: string;
}

function runScanner(scanner: UploadScanner, bytes: Uint8Array): Promise<ScanOutcome> {
  const limit = scanner.maxOutputBytes ?? MAX_OUTPUT_BYTES;
  const timeoutMs = scanner.timeoutMs ?? SCAN_TIMEOUT_MS;
  return new Promise((resolve) => {
    const out: Buffer[] = [];
    const err: Buffer[] = [];
    let kept = 0;
    let settled = false;
    const finish = (o: ScanOutcome) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      resolve(o);
    };
    const text = (parts: Buffer[]) => Buffer.concat(parts).toString('utf8');
    let child: ReturnType<typeof spawn>;
    try {
      child = spawn(scanner.command[0], scanner.command.slice(1), { stdio: ['pipe', 'pipe', 'pipe'], shell: false, windowsHide: true });
    } catch (e) {
      resolve({ code: null, signal: null, stdout: '', stderr: '', failure: `could not start ${scanner.command[0]} (${(e as Error).message})` });
      return;
    }
    const keep = (into: Buffer[]) => (chunk: Buffer) => {
      if (kept >= limit) return;
      const part = chunk.subarray(0, limit - kept);
      kept += part.length;
      into.push(part);
    };
    child.stdout!.on('data', keep(out));
    child.stderr!.on('data', keep(err));
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      finish({ code: null, signal: null, stdout: text(out), stderr: text(err), failure: `no answer within ${Math.round(timeoutMs / 1000)} s` });
    }, timeoutMs);
    child.on('error', (e: NodeJS.ErrnoException) => finish({ code: null, signal: null, stdout: '', stderr: '', failure: `could not start ${scanner.command[0]} (${e.code ?? e.message})` }));
    child.on('close', (code, signal) => finish({ code, signal, stdout: text(out), stderr: text(err) }));
    // A scanner may stop reading early (it found something, or it failed): that is not our error.
    child.stdin!.on('error', () => undefined);
    child.stdin!.end(bytes);
  });
}

/**
 * Scan bytes before anything reads or stores them. Resolves when the scanner says they are clean;
 * throws an InputError (shown to the user, exit code 2 on the command line) otherwise.
 */
export async function scanUpload(scanner: UploadScanner | undefined, bytes: Uint8Array, fileName: string): Promise<void> {
  if (!scanner) return;
  const o = await runScanner(scanner, bytes);
  if (o.failure === undefined && o.code === 0) return;
  if (o.failure === undefined && o.code === 1) {
    const report = firstLine(o.stdout) || firstLine(o.stderr) || 'a threat (no name given)';
    throw new InputError(`The virus scanner refused this file; nothing was imported. The scanner reported: ${report}`, fileName);
  }
  const why = o.failure ?? (o.signal ? `stopped by ${o.signal}` : `exit code ${o.code}`);
  const said = firstLine(o.stderr) || firstLine(o.stdout);
  (scanner.log ?? console.error)(`Upload scan failed (${bytes.length} bytes, ${scanner.command[0]}): ${why}${said ? `; scanner said: ${said}` : ''}`);
  throw new InputError(SCAN_INCOMPLETE, fileName);
}
