/**
 * Columns of the point table on screen: header with unit, and how a value is shown. SI inside; the
 * only display conversions are kelvin → °C and Reynolds number in millions, done here.
 */
import type { PointResult } from '../../../core/index.ts';
import { BLOCKAGE_SYMBOLS } from './factorNames.ts';
import { columnHeader, fixed, formatQuantity, QUANTITY, valueForUncertainty, type Quantity } from './numberFormat.ts';

export type ColumnGroup = 'corrected' | 'uncertainty' | 'measured' | 'flow' | 'blockage';

export interface PointColumn {
  key: keyof PointResult;
  header: string;
  group: ColumnGroup;
  /** What the header's symbol stands for (hover). */
  title?: string;
  /** Text shown in the cell. */
  show(p: PointResult): string;
  /** Value copied to the clipboard / written to exports, in the unit of the header. */
  value(p: PointResult): number | string | null;
}

/**
 * A column of one quantity, at that quantity's screen resolution (numberFormat.ts), its unit in the header.
 * Where the point carries the value's standard uncertainty (`u`), the value is rounded to the place of the
 * uncertainty's second significant digit instead (GUM §7.2.6), as the report exports round it.
 */
function num(key: keyof PointResult, symbol: string, group: ColumnGroup, quantity: Quantity, u?: keyof PointResult): PointColumn {
  return {
    key,
    header: columnHeader(symbol, QUANTITY[quantity].unit),
    group,
    show: (p) => {
      const uv = u ? (p[u] as number | null) : null;
      return uv === null || uv === undefined
        ? formatQuantity(quantity, p[key] as number | null)
        : valueForUncertainty(p[key] as number | null, uv, QUANTITY[quantity].decimals ?? 4);
    },
    value: (p) => p[key] as number | null,
  };
}

/** A standard uncertainty: two significant digits (GUM §7.2.6), in the unit of its quantity. */
function unc(key: keyof PointResult, symbol: string, of: Quantity): PointColumn {
  return {
    key,
    header: columnHeader(symbol, QUANTITY[of].unit),
    group: 'uncertainty',
    show: (p) => formatQuantity('uncertainty', p[key] as number | null),
    value: (p) => p[key] as number | null,
  };
}

function reynolds(key: 'reynolds' | 'reynolds_uncorrected', group: ColumnGroup): PointColumn {
  return {
    key,
    header: columnHeader('Re', QUANTITY.reynolds.unit),
    group,
    show: (p) => formatQuantity('reynolds', p[key]),
    value: (p) => (p[key] === null ? null : p[key]! / 1e6),
  };
}

function celsius(key: 't_static_k' | 't_total_k', symbol: string): PointColumn {
  return {
    key,
    header: columnHeader(symbol, QUANTITY.temperatureC.unit),
    group: 'flow',
    show: (p) => formatQuantity('temperatureC', p[key] - 273.15),
    value: (p) => p[key] - 273.15,
  };
}

function count(key: 'samples' | 'line', header: string, group: ColumnGroup): PointColumn {
  return { key, header, group, show: (p) => fixed(p[key], 0), value: (p) => p[key] };
}

export const POINT_TABLE: readonly PointColumn[] = [
  { key: 'point', header: 'point', group: 'corrected', show: (p) => p.point, value: (p) => p.point },
  count('samples', 'samples', 'corrected'),
  num('alpha_deg', 'α', 'corrected', 'alpha', 'u_alpha_deg'),
  num('cl', 'CL', 'corrected', 'cl', 'u_cl'),
  num('cd', 'CD', 'corrected', 'cd', 'u_cd'),
  num('cm', 'Cm', 'corrected', 'cm', 'u_cm'),
  num('ld', 'L/D', 'corrected', 'ld'),
  num('q_pa', 'q', 'corrected', 'q', 'u_q_pa'),
  num('v_mps', 'V', 'corrected', 'v', 'u_v_mps'),
  num('mach', 'Mach', 'corrected', 'mach'),
  reynolds('reynolds', 'corrected'),
  unc('u_alpha_deg', 'u(α)', 'alpha'),
  unc('u_cl', 'u(CL)', 'cl'),
  unc('u_cd', 'u(CD)', 'cd'),
  unc('u_cm', 'u(Cm)', 'cm'),
  unc('u_q_pa', 'u(q)', 'q'),
  num('alpha_uncorrected_deg', 'α', 'measured', 'alpha'),
  num('cl_uncorrected', 'CL', 'measured', 'cl'),
  num('cd_uncorrected', 'CD', 'measured', 'cd'),
  num('cm_uncorrected', 'Cm', 'measured', 'cm'),
  num('q_uncorrected_pa', 'q', 'measured', 'q'),
  num('v_uncorrected_mps', 'V', 'measured', 'v'),
  reynolds('reynolds_uncorrected', 'measured'),
  num('rho_kgm3', 'ρ', 'flow', 'rho'),
  num('p_static_pa', 'p', 'flow', 'pressure'),
  celsius('t_total_k', 'T₀'),
  num('rh_pct', 'RH', 'flow', 'rh'),
  { ...num('eps_solid', BLOCKAGE_SYMBOLS.eps_solid.symbol, 'blockage', 'epsilon'), title: BLOCKAGE_SYMBOLS.eps_solid.title },
  { ...num('eps_wake', BLOCKAGE_SYMBOLS.eps_wake.symbol, 'blockage', 'epsilon'), title: BLOCKAGE_SYMBOLS.eps_wake.title },
  count('line', 'line', 'blockage'),
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
