/** What the components share, provided once by main.ts (or by a test with fakes). */
import { inject, type InjectionKey } from 'vue';
import type { Host } from '../host/hostAccess.ts';
import type { Exports } from './exports.ts';
import type { PlotLimits } from './plotLimits.ts';
import type { Workbench } from './workbench.ts';

export interface AppContext {
  host: Host;
  wb: Workbench;
  limits: PlotLimits;
  exports: Exports;
}

export const APP: InjectionKey<AppContext> = Symbol('sweepbook');

export function useApp(): AppContext {
  const ctx = inject(APP);
  if (!ctx) throw new Error('Sweepbook context not provided');
  return ctx;
}
