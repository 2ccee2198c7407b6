/**
 * A plot drawn off screen at a fixed size, for the PNG export and the printed summary: white
 * background, provenance footer, no dependence on how large the window happens to be.
 */
import type { ChartConfiguration } from 'chart.js';
import { Chart } from './chartSetup.ts';
import { errorBars, paperFooter, plotMarks, rangeBars } from './plugins.ts';

/** `pixelRatio`: device pixels per CSS px of the image (a print resolution); the layout stays width × height CSS px. */
export function renderPng(config: ChartConfiguration<'scatter'>, width: number, height: number, doc: Document = document, pixelRatio = 1): string {
  const canvas = doc.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  // laid out but out of sight: Chart.js measures the canvas it draws on
  canvas.style.position = 'fixed';
  canvas.style.left = '-20000px';
  canvas.style.top = '0';
  canvas.style.width = `${width}px`;
  canvas.style.height = `${height}px`;
  doc.body.appendChild(canvas);
  const chart = new Chart(canvas, {
    ...config,
    options: { ...config.options, responsive: false, devicePixelRatio: pixelRatio, animation: false },
    plugins: [paperFooter, rangeBars, errorBars, plotMarks],
  });
  try {
    return chart.toBase64Image('image/png');
  } finally {
    chart.destroy();
    canvas.remove();
  }
}

/** Bytes of a data: URL (base64). */
export function dataUrlBytes(url: string): Uint8Array {
  const b64 = url.slice(url.indexOf(',') + 1);
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}
