/** The balance as the run-file reader's per-sample conversion: bridge outputs in, SI loads out. */
import type { SampleTransform } from '../formats/sampleTransform.ts';
import { loadConverter } from './convert.ts';
import type { Balance } from './document.ts';

export function balanceTransform(b: Balance): SampleTransform {
  const convert = loadConverter(b);
  const scale = Float64Array.from(b.units, (u) => u.scale);
  const offset = Float64Array.from(b.units, (u) => u.offset);
  const where = b.fieldPrefix ? `the balance calibration in ${b.file} (${b.fieldPrefix.replace(/\.$/, '')})` : `the balance calibration ${b.file}`;
  return {
    inputs: b.outputs,
    outputs: b.loads,
    source: where,
    apply(raw, out) {
      const why = convert(raw, out);
      if (why !== undefined) return why;
      for (let i = 0; i < out.length; i++) out[i] = out[i]! * scale[i]! + offset[i]!;
      return undefined;
    },
  };
}
