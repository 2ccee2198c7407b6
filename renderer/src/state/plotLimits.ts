/** Zoom limits of each plot, kept outside the chart so they survive redraws and apply to exports. */
import { reactive } from 'vue';
import type { Limits } from '../charts/plotConfig.ts';

export function createPlotLimits() {
  const limits = reactive<Record<string, Limits>>({});
  return {
    limits,
    get: (id: string): Limits => limits[id] ?? {},
    set: (id: string, value: Limits) => {
      limits[id] = value;
    },
    reset: (id: string) => {
      delete limits[id];
    },
  };
}

export type PlotLimits = ReturnType<typeof createPlotLimits>;
