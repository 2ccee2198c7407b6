/** The reduction worker's entry: parsing and reduction run here so the window stays responsive. */
import '../zodConfig.ts';
import { WorkerEngine } from './workerEngine.ts';
import type { FromWorker, ToWorker } from './protocol.ts';

// typed narrowly so the renderer's DOM typings serve for the worker too
const scope = self as unknown as { onmessage: ((e: MessageEvent<ToWorker>) => void) | null; postMessage(msg: FromWorker): void };
const engine = new WorkerEngine((msg) => scope.postMessage(msg));
scope.onmessage = (e) => engine.handle(e.data);
