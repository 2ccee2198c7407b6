/**
 * Command line (DESIGN §3.3):
 *   sweepbook reduce RUN.csv --setup SETUP.json [--tare WINDOFF.csv] [--format json|csv] [--out FILE] [--no-corrections]
 * Standard output carries only the document; messages go to standard error. Exit 0 on success,
 * 1 on input that cannot be reduced, 2 on a wrong command line.
 */
import { createReadStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { pointsCsv, readRun, readSetup, reduceRun } from '../../core/engine.ts';
import { formatNotice, InputError, type Notice } from '../../core/messages.ts';
import { writeFileAtomic } from '../files/atomic.ts';
import { VERSION } from '../version.ts';

const USAGE = `usage:
  sweepbook reduce RUN.csv --setup SETUP.json [--tare WINDOFF.csv] [--format json|csv] [--out FILE] [--no-corrections]
  sweepbook --version`;

class UsageError extends Error {}

export async function main(argv: string[], io = { stdout: process.stdout, stderr: process.stderr }): Promise<number> {
  const say = (line: string) => io.stderr.write(line + '\n');
  try {
    const [command, ...rest] = argv;
    if (command === '--version' || command === '-v') {
      io.stdout.write(`sweepbook ${VERSION}\n`);
      return 0;
    }
    if (command === undefined || command === '--help' || command === '-h') {
      (command === undefined ? say : (l: string) => io.stdout.write(l + '\n'))(USAGE);
      return command === undefined ? 2 : 0;
    }
    if (command === 'reduce') return await reduceCommand(rest, io, say);
    throw new UsageError(`unknown command "${command}"`);
  } catch (err) {
    if (err instanceof UsageError || (err as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      say(`sweepbook: ${(err as Error).message}`);
      say(USAGE);
      return 2;
    }
    say(`sweepbook: internal error: ${(err as Error).message} (please report this with the input files)`);
    return 3;
  }
}

async function reduceCommand(args: string[], io: { stdout: NodeJS.WritableStream }, say: (l: string) => void): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      setup: { type: 'string' },
      tare: { type: 'string' },
      format: { type: 'string', default: 'json' },
      out: { type: 'string' },
      'no-corrections': { type: 'boolean', default: false },
    },
  });
  if (positionals.length !== 1) throw new UsageError(positionals.length === 0 ? 'reduce needs one run file' : `reduce takes one run file, got ${positionals.length}`);
  if (!values.setup) throw new UsageError('reduce needs --setup SETUP.json');
  const format = values.format;
  if (format !== 'json' && format !== 'csv') throw new UsageError(`--format must be json or csv, not "${format}"`);
  const runPath = positionals[0]!;
  const fail = (errors: Notice[]) => {
    for (const e of errors) say(`error: ${formatNotice(e)}`);
    return 1;
  };

  const setupText = await readText(values.setup);
  if (typeof setupText !== 'string') return fail([setupText]);
  const setup = readSetup(values.setup, setupText);
  if (!setup.ok) return fail(setup.errors);

  const run = await readRun(runPath, textStream(runPath));
  if (!run.ok) return fail(run.errors);
  let tare;
  if (values.tare) {
    const t = await readRun(values.tare, textStream(values.tare));
    if (!t.ok) return fail(t.errors);
    tare = t.value;
  }
  const result = reduceRun({ run: run.value, setup: setup.value, tare, noCorrections: values['no-corrections'] });
  if (!result.ok) return fail(result.errors);
  for (const w of result.value.warnings) say(`warning: ${w}`);
  const text = format === 'json' ? JSON.stringify(result.value, null, 2) + '\n' : pointsCsv(result.value);
  if (values.out) {
    await writeFileAtomic(values.out, text);
    say(`wrote ${values.out}`);
  } else {
    io.stdout.write(text);
  }
  return 0;
}

/** A file's text as a stream of chunks; a missing file surfaces as an error naming it. */
async function* textStream(path: string): AsyncGenerator<string> {
  const stream = createReadStream(path, { encoding: 'utf8', highWaterMark: 1 << 20 });
  try {
    for await (const chunk of stream) yield chunk as string;
  } catch (err) {
    throw fileError(path, err);
  }
}

async function readText(path: string): Promise<string | Notice> {
  try {
    return await readFile(path, 'utf8');
  } catch (err) {
    return { file: path, message: describeFsError(err) };
  }
}

function describeFsError(err: unknown): string {
  const code = (err as { code?: string }).code;
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EISDIR') return 'is a folder, not a file';
  if (code === 'EACCES') return 'permission denied';
  return (err as Error).message;
}

function fileError(path: string, err: unknown): InputError {
  return new InputError({ file: path, message: describeFsError(err) });
}
