/**
 * The column-mapping step (docs/data-format.md §2.4 and §5): when a file's header names a column or unit the reader
 * does not know, the user assigns each header cell a contract channel and unit. The result is core's
 * ColumnMapping, remembered in the campaign by header signature.
 */
import { CHANNELS, CHANNEL_NAMES, isChannel, type Channel } from '../../../core/index.ts';
import type { Notice } from '../../../core/index.ts';
import type { ColumnMapping } from '../../../core/index.ts';
import { lookupUnit, unitsOf } from '../../../core/index.ts';
import type { HeaderInfo } from '../worker/protocol.ts';

/** Errors a mapping can cure: an unknown or wrong unit, a required column under another name. */
const CURABLE = [/has unit ".*", which is/, /missing required column/, /the run has no ".*" column/];

export function needsMapping(errors: readonly Notice[]): boolean {
  return errors.some((e) => CURABLE.some((re) => re.test(e.message)));
}

export type Assignment = Channel | 'point' | 'ignore';

export interface CellChoice {
  name: string;
  headerUnit: string | null;
  /** Where the file gives the unit (brackets, parentheses, units row), if it does. */
  unitFrom?: 'brackets' | 'parentheses' | 'units row';
  assign: Assignment;
  /** Always a unit of the quantity, shown and chosen explicitly (never an unstated default). */
  unit: string;
}

/** What a column holds, in the trade's words (the menu shows these, never internal names). */
export const ASSIGNMENT_LABELS: Record<Assignment, string> = {
  ignore: '(not used)',
  point: 'point number',
  alpha: 'angle of attack α',
  dp_pitot: 'pitot-static Δp (impact pressure)',
  p_static: 'static pressure',
  t_total: 'total temperature',
  rh: 'relative humidity',
  lift: 'lift',
  drag: 'drag',
  side: 'side force',
  normal: 'normal force',
  axial: 'axial force',
  pitch: 'pitching moment',
  roll: 'rolling moment',
  yaw: 'yawing moment',
  time: 'time',
  q: 'dynamic pressure q (as logged)',
  dp_contraction: 'contraction Δp (settling chamber to test section)',
};

/** The unit choice matching a unit the file gives ("degrees" → "deg"), or null when it is not one of them. */
export function canonicalUnit(assign: Assignment, text: string | null | undefined): string | null {
  if (!text || assign === 'ignore' || assign === 'point') return null;
  const found = lookupUnit(text);
  if (!found || found.quantity !== CHANNELS[assign].quantity) return null;
  return unitChoices(assign).find((u) => lookupUnit(u)?.label === found.label) ?? found.label;
}

/** Starting unit of a column: remembered, else what the file says, else the channel's usual unit (shown, to be checked). */
export function startingUnit(assign: Assignment, headerUnit: string | null, remembered?: string): string {
  if (assign === 'ignore' || assign === 'point') return '';
  return canonicalUnit(assign, remembered) ?? canonicalUnit(assign, headerUnit) ?? CHANNELS[assign].defaultUnit;
}

/** Header words that commonly name a channel (own heuristic; the user confirms every choice). */
const GUESSES: [RegExp, Assignment][] = [
  [/^(point|pt|point_?no|pointnumber)$/, 'point'],
  [/alpha|^aoa$|angle|incidence/, 'alpha'],
  [/pitot|^q$|^qc$|^dp|impact|dyn/, 'dp_pitot'],
  [/static|^p$|^pa$|baro|^p_?amb/, 'p_static'],
  [/temp|^t$|^t0$|^tt$/, 't_total'],
  [/humid|^rh/, 'rh'],
  [/lift|^l$|^fz$/, 'lift'],
  [/drag|^d$|^fx$/, 'drag'],
  [/side|^y$|^fy$/, 'side'],
  [/normal|^n$/, 'normal'],
  [/axial|^a$/, 'axial'],
  [/pitch|^m$|^my$/, 'pitch'],
  [/roll|^mx$/, 'roll'],
  [/yaw|^mz$/, 'yaw'],
];

export function guessAssignment(name: string): Assignment {
  // a unit in brackets or parentheses is not part of the name ("AoA (deg)")
  const key = name.trim().toLowerCase().replace(/\s*[[(][^\])]*[\])]\s*$/, '');
  if (key === 'point' || isChannel(key)) return key as Assignment;
  const bare = key.replace(/[\s_.-]+/g, '');
  for (const [re, a] of GUESSES) if (re.test(bare)) return a;
  return 'ignore';
}

/** Starting choices: the mapping given before, else what the header says, else a guess. */
export function initialChoices(header: HeaderInfo, previous: ColumnMapping | null): CellChoice[] {
  const taken = new Set<Assignment>();
  return header.cells.map((cell) => {
    const prior = previous?.names?.[cell.name.toLowerCase()];
    let assign: Assignment = prior !== undefined ? (prior as Assignment) : guessAssignment(cell.name);
    if (assign !== 'ignore' && taken.has(assign)) assign = 'ignore';
    taken.add(assign);
    const unit = startingUnit(assign, cell.unit, previous?.units?.[assign]);
    return { name: cell.name, headerUnit: cell.unit, ...(cell.unitFrom ? { unitFrom: cell.unitFrom } : {}), assign, unit };
  });
}

export function unitChoices(assign: Assignment): string[] {
  return assign === 'ignore' || assign === 'point' ? [] : unitsOf(CHANNELS[assign].quantity);
}

/** Problems that would stop the file being read with these choices, one per offending cell. */
export function choiceProblems(choices: readonly CellChoice[]): string[] {
  const problems: string[] = [];
  const seen = new Map<Assignment, string>();
  for (const c of choices) {
    if (c.assign === 'ignore') continue;
    const earlier = seen.get(c.assign);
    if (earlier !== undefined) problems.push(`"${c.name}" and "${earlier}" are both assigned to ${c.assign}`);
    seen.set(c.assign, c.name);
    if (c.assign === 'point') continue;
    const unit = c.unit || c.headerUnit;
    if (!unit) continue;
    const quantity = CHANNELS[c.assign].quantity;
    const found = lookupUnit(unit);
    if (!found) problems.push(`"${c.name}": unit "${unit}" is not known; choose one of ${unitsOf(quantity).join(', ')}`);
    else if (found.quantity !== quantity) problems.push(`"${c.name}": "${unit}" is a ${found.quantity} unit, but ${c.assign} is a ${quantity}`);
  }
  for (const required of ['alpha', 'dp_pitot'] as const) {
    if (!seen.has(required)) problems.push(`no column is assigned to ${required} (${required === 'alpha' ? 'angle of attack' : 'pitot-static impact pressure'})`);
  }
  const wind = seen.has('lift') && seen.has('drag');
  const body = seen.has('normal') && seen.has('axial');
  if (!wind && !body) problems.push('assign either lift and drag (wind axes) or normal and axial (body axes)');
  return problems;
}

/** The ColumnMapping for the reader: every cell named explicitly (so "ignore" sticks), every unit stated. */
export function mappingFrom(choices: readonly CellChoice[]): ColumnMapping {
  const names: Record<string, string> = {};
  const units: Record<string, string> = {};
  for (const c of choices) {
    names[c.name.toLowerCase()] = c.assign;
    if (c.assign !== 'ignore' && c.assign !== 'point' && c.unit) units[c.assign] = c.unit;
  }
  return { names, units };
}

/** A column-map document: the header cell as written → channel and unit, or null for a column not used. */
export interface ColumnMapDocument {
  format: 'sweepbook-columns';
  version: 1;
  columns: Record<string, { channel: string; unit?: string; scale?: number; offset?: number } | null>;
}

/** The choices as a column-map file, shared with the command line's --columns. */
export function columnMapDocument(choices: readonly CellChoice[], header: HeaderInfo): ColumnMapDocument {
  const columns: ColumnMapDocument['columns'] = {};
  const raw = rawHeaderCells(header);
  choices.forEach((c, i) => {
    const key = raw[i] ?? c.name;
    if (c.assign === 'ignore') columns[key] = null;
    else if (c.assign === 'point') columns[key] = { channel: 'point' };
    else columns[key] = { channel: c.assign, unit: c.unit };
  });
  return { format: 'sweepbook-columns', version: 1, columns };
}

/** Header cells exactly as written (trimmed), the keys of a column map. */
function rawHeaderCells(header: HeaderInfo): string[] {
  return header.text.split(header.delimiter).map((c) => c.trim().replace(/^"(.*)"$/, '$1'));
}

/**
 * Choices from a column-map file for this header. Header cells the map does not name keep the choice
 * they had; a map entry naming a column the header lacks, an unknown channel or unit is a problem,
 * named by its key.
 */
export function choicesFromDocument(text: string, header: HeaderInfo, current: readonly CellChoice[], fileName: string): { choices: CellChoice[]; problems: string[] } {
  const problems: string[] = [];
  let doc: ColumnMapDocument;
  try {
    doc = JSON.parse(text) as ColumnMapDocument;
  } catch (err) {
    return { choices: [...current], problems: [`${fileName}: not JSON (${err instanceof Error ? err.message : String(err)})`] };
  }
  if (doc?.format !== 'sweepbook-columns' || typeof doc.columns !== 'object' || doc.columns === null) {
    return { choices: [...current], problems: [`${fileName}: not a column map (expected "format": "sweepbook-columns" and "columns")`] };
  }
  const raw = rawHeaderCells(header);
  const choices = current.map((c) => ({ ...c }));
  for (const [key, entry] of Object.entries(doc.columns)) {
    const i = raw.findIndex((r) => r.toLowerCase() === key.trim().toLowerCase());
    if (i < 0 || !choices[i]) {
      problems.push(`${fileName}: columns."${key}": this file has no such column`);
      continue;
    }
    if (entry === null) {
      choices[i]!.assign = 'ignore';
      choices[i]!.unit = '';
      continue;
    }
    const channel = entry.channel as Assignment;
    if (!(ASSIGNMENTS as readonly string[]).includes(channel) || channel === 'ignore') {
      problems.push(`${fileName}: columns."${key}".channel: "${entry.channel}" is not a channel`);
      continue;
    }
    if (entry.unit !== undefined && channel !== 'point' && !canonicalUnit(channel, entry.unit)) {
      problems.push(`${fileName}: columns."${key}".unit: "${entry.unit}" is not a unit of ${ASSIGNMENT_LABELS[channel]}`);
      continue;
    }
    if (entry.scale !== undefined || entry.offset !== undefined) problems.push(`${fileName}: columns."${key}": scale and offset are applied by the command line; the window takes the channel and unit only`);
    choices[i]!.assign = channel;
    choices[i]!.unit = startingUnit(channel, choices[i]!.headerUnit, entry.unit);
  }
  return { choices, problems };
}

export const ASSIGNMENTS: readonly Assignment[] = ['ignore', 'point', ...CHANNEL_NAMES];
