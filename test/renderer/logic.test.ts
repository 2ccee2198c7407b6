// @vitest-environment happy-dom
/**
 * The view logic that does not need a component: palette, zoom, differences against a baseline,
 * fitted-characteristic rows, column mapping, setup form, exports and clipboard text.
 */
import { describe, expect, it } from 'vitest';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { attempt } from '../../core/contract/messages.ts';
import { provenanceOf } from '../../core/formats/provenance.ts';
import type { PointResult, ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { ASSIGNMENT_LABELS, choiceProblems, choicesFromDocument, columnMapDocument, initialChoices, mappingFrom, needsMapping, type CellChoice } from '../../renderer/src/logic/columnMapping.ts';
import { deltas, interpolate, curveOf } from '../../renderer/src/logic/delta.ts';
import { fitHeader, fitRows, fitsCsvExport, pointsCsvExport } from '../../renderer/src/logic/exportTables.ts';
import { fitCell, FIT_ROWS, fitRowsFor, FOLDED } from '../../renderer/src/logic/fitRows.ts';
import { fixed, millions, significant } from '../../renderer/src/logic/numberFormat.ts';
import { assignStyles, colourOf, configurationOrder, RUN_COLOURS, styleFor } from '../../renderer/src/logic/palette.ts';
import { columnsWithValues } from '../../renderer/src/logic/pointColumns.ts';
import type { ExportProvenance } from '../../renderer/src/logic/provenance.ts';
import { checkSetup, draftFrom, setupFrom } from '../../renderer/src/logic/setupForm.ts';
import { toTsv } from '../../renderer/src/logic/tsv.ts';
import { numberFormat, pointSheet, sheetName, workbookSheets } from '../../renderer/src/logic/xlsxExport.ts';
import { boxRange, typedRange, wheelFactor, zoomAbout } from '../../renderer/src/logic/zoom.ts';
import { sniffHeader } from '../../renderer/src/worker/headerSniff.ts';
import { sample } from './support.ts';

const SETUP_3D = JSON.parse(sample('setup-3d.json')) as Record<string, unknown>;
const SETUP_2D = JSON.parse(sample('setup-2d.json')) as Record<string, unknown>;

function reduceSample(file: string, text: string, setup: unknown, tare?: string): ReductionResult {
  const s = readSetup('setup.json', JSON.stringify(setup));
  if (!s.ok) throw new Error('setup');
  const r = reduceRun({ run: readRunText(file, text), setup: s.value, tare: tare ? readRunText('windoff-tare.csv', tare) : undefined });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** Data lines 0..n-1 of a sample run with its metadata and header. */
function firstRows(file: string, n: number): string {
  const lines = sample(file).split('\n');
  const head = lines.findIndex((l) => l !== '' && !l.startsWith('#'));
  return lines.slice(0, head + 1 + n).join('\n') + '\n';
}

function pt(alpha: number, cl: number, cd = 0.02, cm: number | null = -0.05): PointResult {
  return { alpha_deg: alpha, cl, cd, cm } as PointResult;
}

describe('palette', () => {
  it('uses the Okabe–Ito colours, the weak yellow last', () => {
    // Okabe & Ito, Color Universal Design (2008): the eight colours in sRGB hex
    expect([...RUN_COLOURS].sort()).toEqual(['#000000', '#0072B2', '#009E73', '#56B4E9', '#CC79A7', '#D55E00', '#E69F00', '#F0E442'].sort());
    expect(RUN_COLOURS[RUN_COLOURS.length - 1]).toBe('#F0E442');
  });

  it('gives configurations distinct markers, runs distinct colours', () => {
    const order = configurationOrder(['clean', 'flap 10', 'clean', null, 'flap 20']);
    expect(order).toEqual(['clean', 'flap 10', '', 'flap 20']);
    const styles = order.map((_, i) => styleFor(i, i));
    expect(new Set(styles.map((s) => s.marker)).size).toBe(4);
    expect(new Set(styles.map((s) => s.colour)).size).toBe(4);
  });

  it('never gives two of a thousand runs the same colour, and only valid hex colours', () => {
    const colours = Array.from({ length: 1000 }, (_, i) => colourOf(i));
    expect(new Set(colours).size).toBe(1000);
    for (const c of colours) expect(c).toMatch(/^#[0-9A-F]{6}$/);
    expect(colourOf(8)).not.toBe(RUN_COLOURS[0]);
  });

  it('draws the second run of a configuration open and dashed, the first filled and solid', () => {
    const styles = assignStyles(
      [
        { file: 'a', configuration: 'clean' },
        { file: 'b', configuration: 'flap' },
        { file: 'c', configuration: 'clean' },
      ],
      ['clean', 'flap'],
    );
    const [a, b, c] = ['a', 'b', 'c'].map((f) => styles.get(f)!);
    expect(a!.marker).toBe(c!.marker);
    expect(a!.marker).not.toBe(b!.marker);
    expect([a!.filled, a!.dash.length, a!.repeat]).toEqual([true, 0, 0]);
    expect([c!.filled, c!.dash.length > 0, c!.repeat]).toEqual([false, true, 1]);
    expect(new Set([a!.colour, b!.colour, c!.colour]).size).toBe(3);
  });

  it('honours a chosen colour slot unless an earlier run holds it, and fills the gaps with the rest', () => {
    const styles = assignStyles(
      [
        { file: 'a', configuration: null },
        { file: 'b', configuration: null, chosen: 0 },
        { file: 'c', configuration: null, chosen: 0 },
      ],
      [''],
    );
    expect(styles.get('b')!.colour).toBe(RUN_COLOURS[0]);
    expect(styles.get('a')!.colour).toBe(RUN_COLOURS[1]);
    expect(styles.get('c')!.colour).toBe(RUN_COLOURS[2]);
  });

  it('spends no colour on runs left out of the list (only reduced runs are passed in)', () => {
    const styles = assignStyles([{ file: 'second', configuration: null }], ['']);
    expect(styles.get('second')!.colour).toBe(RUN_COLOURS[0]);
  });
});

describe('typed axis ranges', () => {
  it('takes two numbers, lower first, a decimal comma too', () => {
    expect(typedRange('-5', '20', 'α')).toEqual({ range: { min: -5, max: 20 }, problem: null });
    expect(typedRange('0,5', '1.5', 'CL')).toEqual({ range: { min: 0.5, max: 1.5 }, problem: null });
  });
  it('leaves the axis automatic when both ends are empty', () => {
    expect(typedRange(' ', '', 'α')).toEqual({ range: null, problem: null });
  });
  it('says what is wrong with one end missing, text, or the ends the wrong way round', () => {
    expect(typedRange('1', '', 'α [deg]').problem).toBe('α [deg]: give both ends as numbers, or leave both empty for the full range');
    expect(typedRange('a', '2', 'α').problem).toMatch(/give both ends as numbers/);
    expect(typedRange('3', '3', 'CL').problem).toBe('CL: the lower end (3) must be below the upper end (3)');
  });
});

describe('zoom arithmetic', () => {
  it('keeps the point under the cursor in place', () => {
    const r = zoomAbout({ min: 0, max: 10 }, 2, 0.5);
    expect(r).toEqual({ min: 1, max: 6 });
    // the cursor's fraction of the range is unchanged: 2/10 before, (2-1)/5 after
    expect((2 - r.min) / (r.max - r.min)).toBeCloseTo(0.2, 12);
  });

  it('turns one wheel notch into 15 % and ignores a click without a drag', () => {
    expect(wheelFactor(100)).toBeCloseTo(1.15, 12);
    expect(wheelFactor(-100)).toBeCloseTo(1 / 1.15, 12);
    expect(boxRange(3, 1, 2)).toBeNull();
    expect(boxRange(3, 1, -40)).toEqual({ min: 1, max: 3 });
  });
});

describe('differences against a baseline', () => {
  it('interpolates the baseline linearly at the run angles inside its range only', () => {
    const base = [pt(0, 0.1), pt(2, 0.3), pt(4, 0.5)];
    const run = [pt(1, 0.25), pt(3, 0.45), pt(5, 0.7)];
    const d = deltas(run, base, 'cl');
    expect(d.map((r) => r.alpha)).toEqual([1, 3]);
    expect(d[0]!.baseline).toBeCloseTo(0.2, 12);
    expect(d[0]!.delta).toBeCloseTo(0.05, 12);
    expect(d[1]!.delta).toBeCloseTo(0.05, 12);
  });

  it('merges repeated angles of a return sweep before interpolating', () => {
    const c = curveOf([pt(0, 0.1), pt(2, 0.3), pt(2, 0.5), pt(0, 0.3)], (p) => p.cl);
    expect(c).toEqual({ alpha: [0, 2], value: [0.2, 0.4], u: [null, null] });
    expect(interpolate(c, 1)).toBeCloseTo(0.3, 12);
    expect(interpolate(c, 2.5)).toBeNull();
  });

  it('skips points without a pitching moment', () => {
    expect(deltas([pt(1, 0.2, 0.02, null)], [pt(0, 0, 0.02, 0), pt(2, 0, 0.02, 0)], 'cm')).toEqual([]);
  });
});

describe('fitted characteristics rows', () => {
  it('shows "—" with the engine warning that explains it', () => {
    const short = reduceSample('short.csv', firstRows('run-101-clean.csv', 3), SETUP_3D);
    const slope = fitCell(FIT_ROWS.find((r) => r.key === 'cl_alpha_per_deg')!, short);
    expect(slope.text).toBe('—');
    expect(slope.reason).toMatch(/only 3 points/);

    const rising = reduceSample('rising.csv', firstRows('run-101-clean.csv', 8), SETUP_3D);
    const clmax = fitCell(FIT_ROWS.find((r) => r.key === 'cl_max')!, rising);
    expect(clmax.text).toBe('—');
    expect(clmax.reason).toMatch(/^not reached: CL is still rising at the highest angle of the sweep/);
  });

  it('says why a 2D section has no Oswald efficiency, and shows values with their units', () => {
    const r = reduceSample('run-201-section.csv', sample('run-201-section.csv'), SETUP_2D);
    const e = fitCell(FIT_ROWS.find((x) => x.key === 'oswald_e')!, r);
    expect(e).toEqual({ text: '—', value: null, reason: 'not defined for a 2D section' });
    const slope = fitCell(FIT_ROWS.find((x) => x.key === 'cl_alpha_per_deg')!, r);
    expect(slope.text).toBe(`${r.fit.cl_alpha_per_deg!.toFixed(5)} ± ${r.fit.cl_alpha_u_per_deg!.toFixed(5)}`);
    expect(FIT_ROWS.find((x) => x.key === 'cl_alpha_per_deg')!.unit).toBe('1/deg');
    const range = fitCell(FIT_ROWS.find((x) => x.key === 'linear_range_deg')!, r);
    expect(range.text).toBe(`${r.fit.linear_range_deg![0].toFixed(2)} to ${r.fit.linear_range_deg![1].toFixed(2)}`);
  });

  it('lists every key of the engine fit, known ones labelled', () => {
    const r = reduceSample('run-201-section.csv', sample('run-201-section.csv'), SETUP_2D);
    const rows = fitRowsFor({ ...r.fit, future_key: 1 } as never);
    expect([...rows.map((x) => x.key), ...FOLDED]).toEqual(expect.arrayContaining(Object.keys(r.fit)));
    expect(rows.find((x) => x.key === ('future_key' as never))!.label).toBe('future_key');
  });
});

describe('column mapping', () => {
  it('offers the mapping step for an unknown unit or a missing column, not for other errors', () => {
    const unit = attempt(() => readRunText('a.csv', 'alpha [furlong],dp_pitot,lift,drag\n1,2,3,4\n'));
    expect(unit.ok).toBe(false);
    if (!unit.ok) expect(needsMapping(unit.errors)).toBe(true);
    const binary = attempt(() => readRunText('b.csv', 'a\u0000b\n'));
    if (!binary.ok) expect(needsMapping(binary.errors)).toBe(false);
    const s = readSetup('s', JSON.stringify(SETUP_3D));
    if (!s.ok) throw new Error('setup');
    const missing = reduceRun({ run: readRunText('c.csv', 'aoa,dp_pitot,lift,drag\n1,600,3,4\n'), setup: s.value });
    expect(missing.ok).toBe(false);
    if (!missing.ok) expect(needsMapping(missing.errors)).toBe(true);
  });

  it('builds a mapping with which core reads a renamed file exactly as the original', () => {
    const original = sample('run-103-flap20.csv');
    const renamed = original.replace('alpha [deg],dp_pitot [Pa]', 'AoA [deg],q_c [mbar]').replace(/^(-?[\d.]+),([\d.]+),/gm, (_m, a: string, q: string) => `${a},${(Number(q) / 100).toFixed(6)},`);
    const header = sniffHeader(renamed)!;
    const choices = initialChoices(header, null);
    expect(choices.slice(0, 2).map((c) => c.assign)).toEqual(['alpha', 'dp_pitot']);
    expect(choiceProblems(choices)).toEqual([]);
    const mapping = mappingFrom(choices);
    const a = reduceSample('x.csv', original, SETUP_3D);
    const s = readSetup('s', JSON.stringify(SETUP_3D));
    if (!s.ok) throw new Error('setup');
    const b = reduceRun({ run: readRunText('x.csv', renamed, { mapping }), setup: s.value });
    if (!b.ok) throw new Error(JSON.stringify(b.errors));
    b.value.points.forEach((p, i) => expect(p.cl).toBeCloseTo(a.points[i]!.cl!, 5));
  });

  it('names what is wrong with an assignment', () => {
    const c = (name: string, assign: CellChoice['assign'], unit = '', headerUnit: string | null = null): CellChoice => ({ name, assign, unit, headerUnit });
    const problems = choiceProblems([c('a', 'alpha'), c('b', 'alpha'), c('L', 'lift', 'Pa'), c('X', 'drag', '', 'parsec')]);
    expect(problems).toEqual(
      expect.arrayContaining([
        '"b" and "a" are both assigned to alpha',
        '"L": "Pa" is a pressure unit, but lift is a force',
        expect.stringMatching(/^"X": unit "parsec" is not known; choose one of N, /),
        'no column is assigned to dp_pitot (pitot-static impact pressure)',
      ]),
    );
  });
});

describe('header sniffing', () => {
  it('finds the header after a byte-order mark and metadata, with units and a preview', () => {
    const text = '\uFEFF# run: 7\n\n# note: x\nAlpha [deg];DP_Pitot [kPa];Lift\n1,5;0,6;3\n2,0;0,6;4\n';
    const h = sniffHeader(text)!;
    expect(h.line).toBe(4);
    expect(h.delimiter).toBe(';');
    expect(h.cells).toEqual([
      { name: 'Alpha', unit: 'deg', unitFrom: 'brackets' },
      { name: 'DP_Pitot', unit: 'kPa', unitFrom: 'brackets' },
      { name: 'Lift', unit: null },
    ]);
    expect(h.preview).toEqual([['1,5', '0,6', '3'], ['2,0', '0,6', '4']]);
    expect(h.signature).toBe('alpha [deg];dp_pitot [kpa];lift');
  });

  it('reads units written in parentheses and in a units row below the header', () => {
    const h = sniffHeader('AoA (deg),Pitot (mbar),Lift,Drag,Note\n,,kgf,N,-\n1,2,3,4,x\n')!;
    expect(h.cells.map((c) => [c.unit, c.unitFrom ?? null])).toEqual([
      ['deg', 'parentheses'],
      ['mbar', 'parentheses'],
      ['kgf', 'units row'],
      ['N', 'units row'],
      ['-', 'units row'],
    ]);
    expect(h.unitsRow).toBe(2);
    expect(h.preview).toEqual([['1', '2', '3', '4', 'x']]);
    // a row of numbers is data, not units
    expect(sniffHeader('a,b\n1,2\n')!.unitsRow).toBeUndefined();
  });

  it('starts every column with a stated unit: the file\'s, else the usual one marked as not in the file', () => {
    const h = sniffHeader('AoA (deg),pitot (mbar),lift\n1,2,3\n')!;
    const c = initialChoices(h, null);
    expect(c.map((x) => [x.assign, x.unit, x.unitFrom ?? null])).toEqual([
      ['alpha', 'deg', 'parentheses'],
      ['dp_pitot', 'mbar', 'parentheses'],
      ['lift', 'N', null],
    ]);
    expect(ASSIGNMENT_LABELS.dp_pitot).toMatch(/pitot/);
    expect(Object.values(ASSIGNMENT_LABELS).some((l) => /default|_/.test(l))).toBe(false);
  });

  it('writes and reads column-map files; a key the file lacks, an unknown channel or unit is named', () => {
    const h = sniffHeader('AoA (deg),pitot (mbar),lift,note\n1,2,3,x\n')!;
    const c = initialChoices(h, null);
    const doc = columnMapDocument(c, h);
    expect(doc).toEqual({ format: 'sweepbook-columns', version: 1, columns: { 'AoA (deg)': { channel: 'alpha', unit: 'deg' }, 'pitot (mbar)': { channel: 'dp_pitot', unit: 'mbar' }, lift: { channel: 'lift', unit: 'N' }, note: null } });
    const back = choicesFromDocument(JSON.stringify(doc), h, c.map((x) => ({ ...x, assign: 'ignore' as const, unit: '' })), 'map.json');
    expect(back.problems).toEqual([]);
    expect(back.choices.map((x) => [x.assign, x.unit])).toEqual(c.map((x) => [x.assign, x.unit]));
    const bad = choicesFromDocument(JSON.stringify({ format: 'sweepbook-columns', version: 1, columns: { Pbar: { channel: 'p_static' }, lift: { channel: 'lifts' }, 'AoA (deg)': { channel: 'alpha', unit: 'Pa' } } }), h, c, 'map.json');
    expect(bad.problems).toEqual([
      'map.json: columns."Pbar": this file has no such column',
      'map.json: columns."lift".channel: "lifts" is not a channel',
      'map.json: columns."AoA (deg)".unit: "Pa" is not a unit of angle of attack α',
    ]);
    expect(choicesFromDocument('{', h, c, 'map.json').problems[0]).toMatch(/^map\.json: not JSON/);
  });

  it('waits for the header line to be complete', () => {
    expect(sniffHeader('# run: 1\nalpha,dp_pi')).toBeNull();
  });
});

describe('setup form', () => {
  it('round-trips a setup and keeps the fields the form does not show', () => {
    const draft = draftFrom(SETUP_3D);
    expect(draft['model.chord_m']).toBe('0.225');
    expect(draft['corrections.delta']).toBe('');
    const back = setupFrom(SETUP_3D, draft);
    expect(back).toEqual(SETUP_3D);
    expect(checkSetup('KM-7 wing', back).ok).toBe(true);
  });

  it('puts core\'s message beside the field it names, as typed', () => {
    const draft = { ...draftFrom(SETUP_3D), 'model.chord_m': '0.2x' };
    const check = checkSetup('wing', setupFrom(SETUP_3D, draft));
    expect(check.ok).toBe(false);
    expect(check.byField['model.chord_m']).toMatch(/reference chord, m/);
    const missing = checkSetup('wing', setupFrom(SETUP_3D, { ...draftFrom(SETUP_3D), 'model.area_m2': '' }));
    expect(missing.byField['model.area_m2']).toMatch(/required for a 3d model/);
  });

  it('reports an unknown key where the form has no field for it', () => {
    const check = checkSetup('wing', { ...SETUP_3D, modle: {} });
    expect(check.byField['']).toMatch(/unknown key "modle"; did you mean "model"/);
  });
});

describe('exports', () => {
  const result = reduceSample('run-101-clean.csv', sample('run-101-clean.csv'), SETUP_3D, sample('windoff-tare.csv'));
  const s = readSetup('s', JSON.stringify(SETUP_3D));
  if (!s.ok) throw new Error('setup');
  const record = provenanceOf(result, s.value.setup, {
    version: '0.0.0-test',
    reducedAt: '2026-12-01T10:00:00.000Z',
    inputs: [{ role: 'run', name: 'run-101-clean.csv', sha256: 'ab'.repeat(32) }],
  });
  const prov: ExportProvenance = {
    exportedAt: '2026-12-01T10:05:00.000Z',
    campaign: '=HYPERLINK("x"), "quoted"',
    runs: [{ name: '101', configuration: 'clean', file: 'run-101-clean.csv', record }],
  };

  it('writes the point table as the report table after raw, unquoted provenance lines a comment-skipping reader skips', async () => {
    const csv = pointsCsvExport(prov, result);
    const lines = csv.split('\n');
    const comments = lines.filter((l) => l.startsWith('# '));
    expect(comments.some((l) => l.startsWith('# exported_at: '))).toBe(true);
    expect(comments.some((l) => l.startsWith('# Caution'))).toBe(true);
    expect(lines.some((l) => l.startsWith('"#'))).toBe(false);
    expect(csv).toContain('# run: run-101-clean.csv sha256 ' + 'ab'.repeat(32));
    // text from the campaign cannot become a formula when a spreadsheet splits the line at its commas
    expect(csv).toContain('# campaign: =HYPERLINK("x"), "quoted"');
    expect(csv).not.toMatch(/,\s*=/);
    const Papa = (await import('papaparse')).default;
    const parsed = Papa.parse<string[]>(csv, { comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, units, ...rows] = parsed.data;
    expect(header!.slice(0, 7)).toEqual(['point', 'samples', 'alpha', 'CL', 'CD', 'Cm', 'L/D']);
    expect(units!.slice(0, 8)).toEqual(['-', '-', 'deg', '-', '-', '-', '-', 'Pa']);
    expect(rows.length).toBe(result.points.length);
    for (const r of rows) for (const cell of r.slice(1)) if (cell !== '') expect(cell.replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '').length, cell).toBeLessThanOrEqual(7);
    const cl = header!.indexOf('CL');
    rows.forEach((r, i) => expect(Math.abs(Number(r[cl]) - result.points[i]!.cl!)).toBeLessThanOrEqual(0.5e-4 + 1e-12));
  });

  it('writes the fit summary with the linear range split into two columns', () => {
    const sources = [{ name: '101', configuration: 'clean', file: 'run-101-clean.csv', result, asMeasured: result }];
    const { header, rows } = fitRows(sources);
    expect(header.slice(0, 4)).toEqual(['run', 'configuration', 'file', 'basis']);
    expect(fitHeader(result.fit)).toContain('linear_range_from_deg');
    const from = header.indexOf('linear_range_from_deg');
    expect(rows[0]![from]).toBe(result.fit.linear_range_deg![0]);
    expect(rows[0]![header.indexOf('cl_alpha_per_deg')]).toBe(result.fit.cl_alpha_per_deg);
    expect(rows.map((r) => r[3])).toEqual(['corrected', 'as measured']);
  });

  it('writes the fit summary CSV like the point table: trade-word header, units row, values rounded to their uncertainty, read by a comment-skipping reader', async () => {
    const sources = [{ name: '101', configuration: 'clean', file: 'run-101-clean.csv', result, asMeasured: result }];
    const csv = fitsCsvExport(prov, sources);
    const Papa = (await import('papaparse')).default;
    const parsed = Papa.parse<string[]>(csv, { comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, units, ...rows] = parsed.data;
    expect(header!.slice(0, 4)).toEqual(['run', 'configuration', 'file', 'basis']);
    expect(header).toEqual(expect.arrayContaining(['dCL/dalpha', 'alpha0', 'CLmax', 'CLmax method', 'CD0', 'u(CD0)', 'Oswald e']));
    expect(header!.some((h) => /_deg|_per_|_u$/.test(h))).toBe(false); // no code names
    expect(units![header!.indexOf('alpha0')]).toBe('deg');
    expect(units![header!.indexOf('dCL/dalpha')]).toBe('1/deg');
    expect(rows.map((r) => r[3])).toEqual(['corrected', 'as measured']);
    const fit = result.fit;
    // GUM §7.2.6: u to two significant digits, the value to the same place
    const u = Number(rows[0]![header!.indexOf('u(CD0)')]);
    expect(Math.abs(u - fit.cd0_u!) / fit.cd0_u!).toBeLessThan(0.05);
    const cd0 = rows[0]![header!.indexOf('CD0')]!;
    const place = 10 ** -(u.toString().split('.')[1] ?? '').length;
    expect(Math.abs(Number(cd0) - fit.cd0!)).toBeLessThanOrEqual(place / 2 + 1e-15);
    expect(rows[0]![header!.indexOf('CLmax method')]).toBe(fit.cl_max_method ?? '');
    expect(rows[0]![header!.indexOf('linear range from')]).not.toBe('');
    for (const r of rows) for (const cell of r.slice(4)) if (/^-?[\d.]+(e-?\d+)?$/.test(cell)) expect(cell.replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '').length, cell).toBeLessThanOrEqual(7);
    expect(rows.flat().filter((c) => /\d\.\d{9,}/.test(c))).toEqual([]); // no float noise in the table
  });

  it('names workbook sheets within the spreadsheet limits and uniquely', () => {
    const used = new Set<string>();
    expect(sheetName('Points a/b:c*[d]', used)).toBe('Points a-b-c--d-');
    const long = 'Points of a run with a very long name indeed';
    const one = sheetName(long, used);
    const two = sheetName(long, used);
    expect(one.length).toBeLessThanOrEqual(31);
    expect(two.length).toBeLessThanOrEqual(31);
    expect(one).not.toBe(two);
    const sheets = workbookSheets(prov, [{ name: '101', configuration: 'clean', file: 'run-101-clean.csv', result, asMeasured: result }]);
    expect(sheets.map((x) => x.sheet)).toEqual(['Fit summary', 'Points 101', 'Provenance']);
  });

  it('escapes a formula-like configuration label in the workbook, as in CSV (OWASP CSV injection)', () => {
    const sheets = workbookSheets(prov, [{ name: '101', configuration: '=HYPERLINK("http://x","flap")', file: 'run-101-clean.csv', result, asMeasured: result }]);
    const texts = sheets.flatMap((sh) => (sh.data as unknown[][]).flat()).map((c) => (c && typeof c === 'object' && 'value' in c ? (c as { value: unknown }).value : c)).filter((v): v is string => typeof v === 'string');
    expect(texts.some((t) => t.includes('HYPERLINK'))).toBe(true);
    // the units row's "-" (a ratio) is a text cell, which a spreadsheet never evaluates
    expect(texts.filter((t) => t !== '-' && /^[=+\-@\t\r]/.test(t))).toEqual([]);
  });

  it('writes point sheets with trade names, a units row, both frozen, number formats and widths', () => {
    const sheet = pointSheet('101', result);
    const [head, units, first] = sheet.data as { value: unknown; format?: string }[][];
    expect(head!.slice(0, 4).map((c) => c.value)).toEqual(['point', 'samples', 'alpha', 'CL']);
    expect(units![2]!.value).toBe('deg');
    expect(sheet.stickyRowsCount).toBe(2);
    expect(first![3]!.format).toBe('0.0000');
    expect(first![3]!.value).toBe(result.points[0]!.cl);
    expect(sheet.columns!.every((c) => (c.width ?? 0) >= 9)).toBe(true);
    expect(numberFormat({ key: 'reynolds', header: 'Re', unit: '-', decimals: 'sig:4' })).toBe('0.000E+00');
  });

  it('copies tab-separated text a spreadsheet cannot run as a formula', () => {
    expect(toTsv([['a\tb', '=1+1', 2.5, null], ['x\ny', -3, '', undefined]])).toBe("a b\t'=1+1\t2.5\t\nx y\t-3\t\t\n");
  });

  it('hides uncertainty and blockage columns without values', () => {
    const keys = columnsWithValues(result.points).map((c) => c.key);
    expect(keys).toContain('eps_solid');
    expect(keys).not.toContain('u_cl');
    const off = columnsWithValues(result.points.map((p) => ({ ...p, eps_solid: null, eps_wake: null }))).map((c) => c.key);
    expect(off).not.toContain('eps_solid');
  });
});

describe('number display', () => {
  it('never shows a negative zero, and gives Reynolds numbers in millions', () => {
    expect(fixed(-0.00001, 3)).toBe('0.000');
    expect(fixed(null, 2)).toBe('—');
    expect(millions(470_724.36)).toBe('0.471');
    expect(significant(9.59e-5, 3)).toBe('9.59e-5');
    expect(significant(0.000271, 3)).toBe('0.000271');
  });
});
