// Small helpers shared by the import tests.
import { InputError, type Table } from '../../../../src/text/types.js';
import { readTable, type ReadTableOptions } from '../../../../src/text/import/index.js';

export const utf8 = (s: string): Uint8Array => new TextEncoder().encode(s);

export function readText(text: string, fileName = 'answers.csv', options?: ReadTableOptions): Promise<Table> {
  return readTable(utf8(text), fileName, options);
}

/** The InputError a read throws; fails the test if it resolves or throws anything else. */
export async function inputError(p: Promise<unknown>): Promise<InputError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof InputError) return err;
    throw new Error(`expected an InputError, got ${String(err)}`);
  }
  throw new Error('expected an InputError, but the read succeeded');
}
