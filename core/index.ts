/**
 * The one public entry of the engine for its hosts: `app/` (command line, Electron main and
 * preload) and `renderer/` import from here and nowhere else in `core/` (checked by
 * test/unit/layers.test.ts). Tests may reach the modules themselves.
 */
export * from './contract/host.ts';
export * from './contract/messages.ts';
export * from './fits/characteristics.ts';
export * from './formats/campaign.ts';
export * from './formats/channels.ts';
export * from './formats/columnMap.ts';
export * from './formats/csvWriter.ts';
export * from './formats/limits.ts';
export * from './formats/provenance.ts';
export * from './formats/runFile.ts';
export * from './formats/sheet.ts';
export * from './fullscale/stallSpeed.ts';
export * from './physics/air.ts';
export * from './physics/units.ts';
export * from './reduction/engine.ts';
export * from './reduction/pipeline.ts';
export * from './setup/schema.ts';
export * from './setup/fields.ts';
// --- balance calibration, flow angle, repeatability ---
export * from './balance/document.ts';
export * from './balance/convert.ts';
export * from './balance/calibrate.ts';
export * from './balance/transform.ts';
export * from './formats/sampleTransform.ts';
export * from './flowAngle/upflow.ts';
export * from './analysis/repeatability.ts';
// --- end of balance calibration, flow angle, repeatability ---

// ---- report tables (point table with trade names, units row, rounded numbers) ----
export * from './formats/reportTable.ts';
export { bracket, finiteOrNull, interpolate, interpolateAt, maxOf, minOf } from './physics/numbers.ts';
