import type { Quantity, UnitConversion } from '../physics/units.ts';
import { lookupUnit } from '../physics/units.ts';

/**
 * Run-file columns of the data contract and the unit each assumes without one written.
 * `q`, `dp_contraction` and `time` are the contract's second-version additions: the facility's own
 * dynamic pressure, the contraction pressure drop, and the clock that orders zero readings.
 */
export const CHANNELS = {
  alpha: { quantity: 'angle', defaultUnit: 'deg' },
  dp_pitot: { quantity: 'pressure', defaultUnit: 'Pa' },
  q: { quantity: 'pressure', defaultUnit: 'Pa' },
  dp_contraction: { quantity: 'pressure', defaultUnit: 'Pa' },
  p_static: { quantity: 'pressure', defaultUnit: 'Pa' },
  t_total: { quantity: 'temperature', defaultUnit: 'degC' },
  rh: { quantity: 'ratio', defaultUnit: '%' },
  lift: { quantity: 'force', defaultUnit: 'N' },
  drag: { quantity: 'force', defaultUnit: 'N' },
  side: { quantity: 'force', defaultUnit: 'N' },
  normal: { quantity: 'force', defaultUnit: 'N' },
  axial: { quantity: 'force', defaultUnit: 'N' },
  pitch: { quantity: 'moment', defaultUnit: 'N m' },
  roll: { quantity: 'moment', defaultUnit: 'N m' },
  yaw: { quantity: 'moment', defaultUnit: 'N m' },
  time: { quantity: 'time', defaultUnit: 's' },
} as const satisfies Record<string, { quantity: Quantity; defaultUnit: string }>;

export type Channel = keyof typeof CHANNELS;
export const CHANNEL_NAMES = Object.keys(CHANNELS) as Channel[];
export const POINT_COLUMN = 'point';

/** Loads measured by the balance, in its own axes. */
export const WIND_LOADS: readonly Channel[] = ['lift', 'drag', 'side', 'pitch', 'roll', 'yaw'];
export const BODY_LOADS: readonly Channel[] = ['normal', 'axial', 'side', 'pitch', 'roll', 'yaw'];
export const FLOW_CHANNELS: readonly Channel[] = ['dp_pitot', 'p_static', 't_total', 'rh'];
/** Pressure columns that give the dynamic pressure, in order of precedence when several are present. */
export const PRESSURE_SOURCES: readonly Channel[] = ['q', 'dp_pitot', 'dp_contraction'];

export function isChannel(name: string): name is Channel {
  return Object.prototype.hasOwnProperty.call(CHANNELS, name);
}

export function defaultConversion(ch: Channel): UnitConversion {
  const conv = lookupUnit(CHANNELS[ch].defaultUnit);
  if (!conv) throw new Error(`no default unit for ${ch}`);
  return conv;
}
