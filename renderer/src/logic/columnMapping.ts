/**
 * The column-mapping step (DESIGN §3.1 columns): when a file's header names a column or unit the reader
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
  assign: Assignment;
  /** '' keeps the header's unit (or the contract's default when the header gives none). */
  unit: string;
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
  const key = name.trim().toLowerCase();
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
    const unit = assign !== 'ignore' && assign !== 'point' ? previous?.units?.[assign] ?? '' : '';
    return { name: cell.name, headerUnit: cell.unit, assign, unit };
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

/** The ColumnMapping for the reader: every cell named explicitly (so "ignore" sticks), units where chosen. */
export function mappingFrom(choices: readonly CellChoice[]): ColumnMapping {
  const names: Record<string, string> = {};
  const units: Record<string, string> = {};
  for (const c of choices) {
    names[c.name.toLowerCase()] = c.assign;
    if (c.assign !== 'ignore' && c.assign !== 'point' && c.unit) units[c.assign] = c.unit;
  }
  return { names, units };
}

export const ASSIGNMENTS: readonly Assignment[] = ['ignore', 'point', ...CHANNEL_NAMES];
