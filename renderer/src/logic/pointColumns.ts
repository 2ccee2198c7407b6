/**
 * Columns of the point table on screen: header with unit, and how a value is shown. SI inside; the
 * only display conversions are kelvin → °C and Reynolds number in millions, done here.
 */
import type { PointResult } from '../../../core/reduce.ts';
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
  { key: 'u_alpha_deg', header: 'u(α) [deg]', group: 'uncertainty', show: (p) => significant(p.u_alpha_deg, 2), value: (p) => p.u_alpha_deg },
  { key: 'u_cl', header: 'u(CL)', group: 'uncertainty', show: (p) => significant(p.u_cl, 2), value: (p) => p.u_cl },
  { key: 'u_cd', header: 'u(CD)', group: 'uncertainty', show: (p) => significant(p.u_cd, 2), value: (p) => p.u_cd },
  { key: 'u_cm', header: 'u(Cm)', group: 'uncertainty', show: (p) => significant(p.u_cm, 2), value: (p) => p.u_cm },
  { key: 'u_q_pa', header: 'u(q) [Pa]', group: 'uncertainty', show: (p) => significant(p.u_q_pa, 2), value: (p) => p.u_q_pa },
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
  { key: 'eps_solid', header: 'ε solid', group: 'blockage', show: (p) => significant(p.eps_solid, 3), value: (p) => p.eps_solid },
  { key: 'eps_wake', header: 'ε wake', group: 'blockage', show: (p) => significant(p.eps_wake, 3), value: (p) => p.eps_wake },
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
