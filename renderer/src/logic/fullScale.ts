/**
 * The full-scale estimate's form and tables. What the typed text means, core's messages placed beside
 * the field they name, and per run the stall and lift-off speeds from its CLmax by core's projection
 * (core/projection.ts: V_s = √(2·m·g0/(ρ·S·CLmax)), ρ from ISO 2533 and CIPM-2007). Nothing physical is
 * computed here; this module gathers the inputs and lays core's results out.
 */
import { isaAtmosphere } from '../../../core/index.ts';
import { attempt, type Notice } from '../../../core/index.ts';
import { DEFAULT_LIFT_OFF_FACTOR, LIFT_OFF_RANGE, projectStallSpeed, type Projection, type ProjectionInput } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';
import { FIT_ROWS, nullReason } from './fitRows.ts';
import { fixed } from './numberFormat.ts';

export type TemperatureMode = 'temperature' | 'isa-deviation';

/** The form as typed (text, so a half-typed number stays as it is). */
export interface FullScaleDraft {
  mass: string;
  wingArea: string;
  altitude: string;
  temperatureMode: TemperatureMode;
  temperature: string;
  isaDeviation: string;
  rh: string;
  liftOffFactor: string;
}

export type DraftKey = Exclude<keyof FullScaleDraft, 'temperatureMode'>;

export interface InputField {
  key: DraftKey;
  label: string;
  unit: string;
  /** Shown under the field while it has no message. */
  help: string;
  required?: boolean;
}

export const LIFT_OFF_NOTE = `common practice ${LIFT_OFF_RANGE[0]}–${LIFT_OFF_RANGE[1]} × V_s; ${DEFAULT_LIFT_OFF_FACTOR} if empty`;

export const INPUT_FIELDS: Readonly<Record<DraftKey, InputField>> = {
  mass: { key: 'mass', label: 'Aircraft mass', unit: 'kg', help: 'the mass at which the stall speed is wanted', required: true },
  wingArea: { key: 'wingArea', label: 'Wing reference area', unit: 'm²', help: 'full scale, on the same definition as the model\'s reference area', required: true },
  altitude: { key: 'altitude', label: 'Pressure altitude', unit: 'm', help: '0 m if empty' },
  temperature: { key: 'temperature', label: 'Outside air temperature', unit: '°C', help: 'standard temperature at the altitude if empty' },
  isaDeviation: { key: 'isaDeviation', label: 'Deviation from standard temperature', unit: 'K', help: '0 K if empty' },
  rh: { key: 'rh', label: 'Relative humidity', unit: '%', help: '0 % (dry air) if empty' },
  liftOffFactor: { key: 'liftOffFactor', label: 'Lift-off factor', unit: '–', help: LIFT_OFF_NOTE },
};

export function emptyDraft(): FullScaleDraft {
  return { mass: '', wingArea: '', altitude: '0', temperatureMode: 'temperature', temperature: '', isaDeviation: '0', rh: '0', liftOffFactor: String(DEFAULT_LIFT_OFF_FACTOR) };
}

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * Typed text as a number: empty → undefined (core's default applies), anything that is not a plain
 * number → NaN, so core's check names the field. No decimal comma: "1,000" must not become 1 kg.
 */
export function numberOf(text: string): number | undefined {
  const t = text.trim().replace(/^−/, '-');
  if (t === '') return undefined;
  return NUMBER.test(t) ? Number(t) : NaN;
}

export type Inputs = Omit<ProjectionInput, 'clMax' | 'modelReynolds'>;

/** The projection's inputs from the form; a required field left empty becomes NaN (refused by core). */
export function projectionInputs(d: FullScaleDraft): Inputs {
  const byTemperature = d.temperatureMode === 'temperature';
  return {
    massKg: numberOf(d.mass) ?? NaN,
    wingAreaM2: numberOf(d.wingArea) ?? NaN,
    pressureAltitudeM: numberOf(d.altitude),
    tempC: byTemperature ? numberOf(d.temperature) : undefined,
    isaDeviationC: byTemperature ? undefined : numberOf(d.isaDeviation),
    rhPct: numberOf(d.rh),
    liftOffFactor: numberOf(d.liftOffFactor),
  };
}

/** The standard (ISO 2533) temperature at the typed pressure altitude, °C; null while it is not a usable altitude. */
export function standardTemperatureC(altitudeText: string): number | null {
  const H = numberOf(altitudeText) ?? 0;
  if (!Number.isFinite(H) || H < -1000 || H > 20000) return null;
  return isaAtmosphere(H).T - 273.15;
}

export interface InputCheck {
  ok: boolean;
  /** Core's message for each field it refused. */
  byField: Partial<Record<DraftKey, string>>;
  /** Required fields not filled in yet (not an error while the user has not typed them). */
  missing: DraftKey[];
  inputs: Inputs;
}

/** Which form field a notice of core's names (its `field` is the command line's option name). */
function fieldOf(notice: Notice, mode: TemperatureMode): DraftKey | null {
  const map: Record<string, DraftKey> = {
    'mass-kg': 'mass',
    'wing-area-m2': 'wingArea',
    'pressure-altitude-m': 'altitude',
    'temp-c': mode === 'temperature' ? 'temperature' : 'isaDeviation',
    'rh-pct': 'rh',
    'lift-off-factor': 'liftOffFactor',
  };
  return notice.field !== undefined ? map[notice.field] ?? null : null;
}

/** A valid stand-in for a refused option, so the next try can find the next refused field. */
function standIn(trial: ProjectionInput, key: DraftKey): void {
  if (key === 'mass') trial.massKg = 1;
  else if (key === 'wingArea') trial.wingAreaM2 = 1;
  else if (key === 'altitude') trial.pressureAltitudeM = 0;
  else if (key === 'rh') trial.rhPct = 0;
  else if (key === 'liftOffFactor') trial.liftOffFactor = undefined;
  else {
    trial.tempC = undefined;
    trial.isaDeviationC = undefined;
  }
}

/**
 * Check the form with core's own projection, as the user types: every refused field gets core's message
 * (a field is given a valid stand-in and the check repeated, so two bad fields show two messages).
 * CLmax is a stand-in of 1 here; each run's own is checked when it is projected.
 */
export function checkInputs(d: FullScaleDraft): InputCheck {
  const inputs = projectionInputs(d);
  const missing = (['mass', 'wingArea'] as const).filter((k) => d[k].trim() === '');
  const byField: Partial<Record<DraftKey, string>> = {};
  const trial: ProjectionInput = { ...inputs, clMax: 1 };
  for (const key of missing) standIn(trial, key);
  for (let i = 0; i < Object.keys(INPUT_FIELDS).length; i++) {
    const r = attempt(() => projectStallSpeed(trial));
    if (r.ok) break;
    const notice = r.errors[0]!;
    const key = fieldOf(notice, d.temperatureMode);
    // a refusal the form has no field for would be a defect here: show it rather than loop
    if (key === null || byField[key] !== undefined) throw new Error(`unexpected refusal of the full-scale inputs: ${notice.message}`);
    byField[key] = temperatureMessage(key, notice.message, trial);
    standIn(trial, key);
  }
  return { ok: missing.length === 0 && Object.keys(byField).length === 0, byField, missing, inputs };
}

/** With a deviation typed, core's temperature message is about the temperature it gives; say which. */
function temperatureMessage(key: DraftKey, message: string, trial: ProjectionInput): string {
  if (key !== 'isaDeviation' || trial.isaDeviationC === undefined || !Number.isFinite(trial.isaDeviationC)) return message;
  const H = trial.pressureAltitudeM ?? 0;
  const t = isaAtmosphere(H).T - 273.15 + trial.isaDeviationC;
  return `the outside air temperature this gives, ${fixed(t, 1)} °C: ${message}`;
}

export interface RunToProject {
  file: string;
  label: string;
  /** The run's free-air corrected result; null while it is not reduced. */
  result: ReductionResult | null;
}

export interface FullScaleRow {
  file: string;
  label: string;
  clMax: number | null;
  /** Why there is no CLmax to project (only when clMax is null). */
  reason: string | null;
  /** A qualification of the CLmax used (e.g. wall corrections off in its setup). */
  note: string | null;
  /** Model Reynolds number at the highest measured CL (for the scale-effect caution). */
  reynolds: number | null;
  projection: Projection | null;
}

const CLMAX_ROW = FIT_ROWS.find((r) => r.key === 'cl_max')!;
export const SECTION_REASON = 'a 2D section\'s maximum lift coefficient is a section value, not an aircraft\'s CLmax';

/** Model Reynolds number at the point of highest CL, as the command line's `project` takes it. */
export function reynoldsAtPeak(result: ReductionResult): number | null {
  let best: ReductionResult['points'][number] | undefined;
  for (const p of result.points) if (p.cl !== null && (best === undefined || p.cl > best.cl!)) best = p;
  return best?.reynolds ?? null;
}

/** Each run's CLmax and, when the inputs are valid, core's projection from it. */
export function projectRuns(check: InputCheck, runs: readonly RunToProject[]): FullScaleRow[] {
  return runs.map(({ file, label, result }) => {
    const row: FullScaleRow = { file, label, clMax: null, reason: null, note: null, reynolds: null, projection: null };
    if (!result) return { ...row, reason: 'not reduced' };
    if (result.corrections.kind === '2d') return { ...row, reason: SECTION_REASON };
    const clMax = result.fit.cl_max;
    if (clMax === null) return { ...row, reason: nullReason(CLMAX_ROW, result) };
    row.clMax = clMax;
    row.reynolds = reynoldsAtPeak(result);
    if (!result.corrections.enabled) row.note = 'as measured: wall corrections are off in this run\'s setup';
    if (check.ok) {
      const r = attempt(() => projectStallSpeed({ ...check.inputs, clMax, modelReynolds: row.reynolds }));
      if (r.ok) row.projection = r.value;
      else row.reason = r.errors[0]!.message;
    }
    return row;
  });
}

export interface StallChange {
  file: string;
  label: string;
  clMax: number;
  deltaClMax: number;
  vStallMps: number;
  /** V_s − V_s(baseline), m/s. */
  deltaMps: number;
  /** 100·(V_s − V_s,base)/V_s,base. */
  deltaPct: number;
}

/** How each projected run's stall speed differs from the baseline run's (negative: lower). */
export function stallChanges(rows: readonly FullScaleRow[], baseline: string | null): { base: FullScaleRow | null; changes: StallChange[] } {
  const base = rows.find((r) => r.file === baseline && r.projection) ?? null;
  if (!base) return { base: null, changes: [] };
  const vb = base.projection!.v_stall_mps;
  const changes = rows
    .filter((r) => r.file !== base.file && r.projection)
    .map((r) => {
      const v = r.projection!.v_stall_mps;
      return { file: r.file, label: r.label, clMax: r.clMax!, deltaClMax: r.clMax! - base.clMax!, vStallMps: v, deltaMps: v - vb, deltaPct: (100 * (v - vb)) / vb };
    });
  return { base, changes };
}
