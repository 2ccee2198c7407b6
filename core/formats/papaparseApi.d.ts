/**
 * The part of papaparse's API that core uses, for the core-only type check (tsconfig.core.json maps
 * `papaparse` here). `@types/papaparse` references Node's types for its stream API, which would
 * declare `process`, `Buffer` and the rest for every core file and hide a Node use in core.
 * Kept to the calls core makes; the full check against `@types/papaparse` still runs in tsconfig.json.
 */
export interface ParseError {
  type: 'Quotes' | 'Delimiter' | 'FieldMismatch';
  code: string;
  message: string;
  row?: number;
  index?: number;
}

export interface ParseResult<T> {
  data: T[];
  errors: ParseError[];
}

export interface ParseConfig {
  delimiter?: string;
  newline?: '\r' | '\n' | '\r\n';
  skipEmptyLines?: boolean | 'greedy';
}

export interface UnparseConfig {
  newline?: string;
  delimiter?: string;
}

declare const Papa: {
  parse<T>(input: string, config?: ParseConfig): ParseResult<T>;
  unparse(data: unknown[][], config?: UnparseConfig): string;
};
export default Papa;
