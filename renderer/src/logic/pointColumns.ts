/**
 * Columns of the point table on screen: header with unit, and how a value is shown. SI inside; the
 * only display conversions are kelvin → °C and Reynolds number in millions, done here.
 */
import type { PointResult } from '../../../core/index.ts';
import { fixed, millions, significant } from './numberFormat.ts';

export type ColumnGroup = 'corrected' | 'uncertainty' | 'measured' | 'flow' | 'blockage';

export interface PointColumn {
  key: keyof PointResult;
  header: string;
  group: ColumnGroup;
  /** Text shown in the cell. */
  show(p: PointResult): string;
  /** Value copied to the clipboard / written to exports, in the unit of the header. */
  value(p: PointResult): number | string | null;
}

function num(key: keyof PointResult, header: string, group: ColumnGroup, decimals: number): PointColumn {
  return {
    key,
    header,
    group,
    show: (p) => fixed(p[key] as number | null, decimals),
    value: (p) => p[key] as number | null,
  };
}

/** A column shown to a number of significant digits (uncertainties, blockage terms). */
function sig(key: keyof PointResult, header: string, group: ColumnGroup, digits: number): PointColumn {
  return { key, header, group, show: (p) => significant(p[key] as number | null, digits), value: (p) => p[key] as number | null };
}

function reynolds(key: 'reynolds' | 'reynolds_uncorrected', header: string, group: ColumnGroup): PointColumn {
  return { key, header, group, show: (p) => millions(p[key]), value: (p) => (p[key] === null ? null : p[key]! / 1e6) };
}

function celsius(key: 't_static_k' | 't_total_k', header: string): PointColumn {
  return { key, header, group: 'flow', show: (p) => fixed(p[key] - 273.15, 2), value: (p) => p[key] - 273.15 };
}

export const POINT_TABLE: readonly PointColumn[] = [
  { key: 'point', header: 'point', group: 'corrected', show: (p) => p.point, value: (p) => p.point },
  num('samples', 'samples', 'corrected', 0),
  num('alpha_deg', 'α [deg]', 'corrected', 3),
  num('cl', 'CL', 'corrected', 4),
  num('cd', 'CD', 'corrected', 5),
  num('cm', 'Cm', 'corrected', 4),
  num('ld', 'L/D', 'corrected', 2),
  num('q_pa', 'q [Pa]', 'corrected', 1),
  num('v_mps', 'V [m/s]', 'corrected', 2),
  num('mach', 'Mach', 'corrected', 4),
  reynolds('reynolds', 'Re [10⁶]', 'corrected'),
  sig('u_alpha_deg', 'u(α) [deg]', 'uncertainty', 2),
  sig('u_cl', 'u(CL)', 'uncertainty', 2),
  sig('u_cd', 'u(CD)', 'uncertainty', 2),
  sig('u_cm', 'u(Cm)', 'uncertainty', 2),
  sig('u_q_pa', 'u(q) [Pa]', 'uncertainty', 2),
  num('alpha_uncorrected_deg', 'α [deg]', 'measured', 3),
  num('cl_uncorrected', 'CL', 'measured', 4),
  num('cd_uncorrected', 'CD', 'measured', 5),
  num('cm_uncorrected', 'Cm', 'measured', 4),
  num('q_uncorrected_pa', 'q [Pa]', 'measured', 1),
  num('v_uncorrected_mps', 'V [m/s]', 'measured', 2),
  reynolds('reynolds_uncorrected', 'Re [10⁶]', 'measured'),
  num('rho_kgm3', 'ρ [kg/m³]', 'flow', 4),
  num('p_static_pa', 'p [Pa]', 'flow', 0),
  celsius('t_total_k', 'T₀ [°C]'),
  num('rh_pct', 'RH [%]', 'flow', 1),
  sig('eps_solid', 'ε solid', 'blockage', 3),
  sig('eps_wake', 'ε wake', 'blockage', 3),
  num('line', 'line', 'blockage', 0),
];

/** Columns with at least one value in these points (uncertainties only exist with a setup's uncertainty block). */
export function columnsWithValues(points: readonly PointResult[]): PointColumn[] {
  return POINT_TABLE.filter((c) => (c.group !== 'uncertainty' && c.group !== 'blockage') || points.some((p) => p[c.key] !== null && p[c.key] !== undefined));
}

export const GROUP_TITLES: Record<ColumnGroup, string> = {
  corrected: 'Free-air corrected',
  uncertainty: 'Standard uncertainty (k = 1)',
  measured: 'As measured in the tunnel',
  flow: 'Flow',
  blockage: 'Blockage',
};
