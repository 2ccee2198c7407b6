/**
 * Stand-in for chart.js in component tests: happy-dom has no 2D canvas, so drawing is tested in the
 * browser suite; here the configurations the components hand to Chart.js are recorded and checked.
 */
export interface MockChart {
  canvas: unknown;
  data: { datasets: { label?: string; data: { x: number; y: number }[]; borderColor?: string; pointStyle?: string; borderDash?: number[] }[] };
  options: Record<string, unknown>;
  destroyed: boolean;
  updates: number;
  /** The plugins the chart was made with (by id). */
  plugins: string[];
}

export const charts: MockChart[] = [];

class Chart {
  static defaults = { font: {} as Record<string, unknown>, color: '', animation: true };
  static register(): void {}
  canvas: unknown;
  data: MockChart['data'];
  options: Record<string, unknown>;
  destroyed = false;
  updates = 0;
  scales: Record<string, unknown> = {};
  plugins: string[];
  constructor(canvas: unknown, config: { data: MockChart['data']; options?: Record<string, unknown>; plugins?: { id: string }[] }) {
    this.canvas = canvas;
    this.plugins = (config.plugins ?? []).map((p) => p.id);
    this.data = config.data;
    this.options = config.options ?? {};
    charts.push(this);
  }
  update(): void {
    this.updates++;
  }
  render(): void {}
  destroy(): void {
    this.destroyed = true;
  }
  toBase64Image(): string {
    return 'data:image/png;base64,iVBORw0KGgo=';
  }
  getDatasetMeta() {
    return { hidden: false, data: [] };
  }
}

const part = {};
export default {
  Chart,
  charts,
  ScatterController: part,
  LineElement: part,
  PointElement: part,
  LinearScale: part,
  Tooltip: part,
  Legend: part,
  Title: part,
  // the plots' own hover mode is registered here (charts/chartSetup.ts)
  Interaction: { modes: {} as Record<string, unknown> },
};
