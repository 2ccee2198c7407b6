import './zodConfig.ts';
import { createApp } from 'vue';
import App from './App.vue';
import './styles/app.css';
import './charts/chartSetup.ts';
import { EngineClient, workerTransport } from './engine/engineClient.ts';
import { resolveHost } from './host/hostAccess.ts';
import { APP } from './state/context.ts';
import { createExports } from './state/exports.ts';
import { createPlotLimits } from './state/plotLimits.ts';
import { createWorkbench } from './state/workbench.ts';

const FIRST_START_KEY = 'sweepbook.sampleShown';

const host = resolveHost(window);
const engine = new EngineClient(workerTransport());
const wb = createWorkbench(host, engine, { ask: async (question) => window.confirm(question) });
const limits = createPlotLimits();
const exports = createExports(wb, host, limits);

createApp(App).provide(APP, { host, wb, limits, exports }).mount('#app');

void wb.refreshRecent();
// a reload or restart brings back the campaign being worked on; the very first start opens the bundled
// sample campaign, so there is something to look at
void wb.resumeSession().then(async (resumed) => {
  if (resumed || localStorage.getItem(FIRST_START_KEY) !== null) return;
  localStorage.setItem(FIRST_START_KEY, new Date().toISOString());
  await wb.openSample();
});
