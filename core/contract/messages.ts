/**
 * Messages about the user's input. Every one names where the problem is: the file with its
 * 1-based line and column, or the setup field. Errors stop a reduction; warnings travel with the result.
 */

export interface Place {
  file?: string;
  line?: number;
  column?: number;
  /** Setup field path, e.g. "model.chord_m". */
  field?: string;
}

export interface Notice extends Place {
  message: string;
}

/** "file:line:column: message" (or "file: field: message"), the form compilers taught everyone to read. */
export function formatNotice(n: Notice): string {
  const parts: string[] = [];
  if (n.file !== undefined) {
    let where = n.file;
    if (n.line !== undefined) where += `:${n.line}`;
    if (n.line !== undefined && n.column !== undefined) where += `:${n.column}`;
    parts.push(where);
  }
  if (n.field !== undefined) parts.push(n.field);
  parts.push(n.message);
  return parts.join(': ');
}

/** A problem with the user's input that stops the reduction. Thrown inside core, caught at its API. */
export class InputError extends Error {
  readonly notice: Notice;
  constructor(notice: Notice) {
    super(formatNotice(notice));
    this.name = 'InputError';
    this.notice = notice;
  }
}

export type Outcome<T> = { ok: true; value: T } | { ok: false; errors: Notice[] };

/** Run a step; an InputError becomes a failed outcome, anything else is a bug and propagates. */
export function attempt<T>(step: () => T): Outcome<T> {
  try {
    return { ok: true, value: step() };
  } catch (err) {
    if (err instanceof InputError) return { ok: false, errors: [err.notice] };
    throw err;
  }
}
