/** The balance as the run-file reader's per-sample conversion: bridge outputs in, SI loads out. */
import type { SampleTransform } from '../formats/sampleTransform.ts';
import { loadsFromOutputs } from './convert.ts';
import type { Balance } from './document.ts';

export function balanceTransform(b: Balance): SampleTransform {
  const where = b.fieldPrefix ? `the balance calibration in ${b.file} (${b.fieldPrefix.replace(/\.$/, '')})` : `the balance calibration ${b.file}`;
  return {
    inputs: b.outputs,
    outputs: b.loads,
    source: where,
    apply(raw, out) {
      const s = loadsFromOutputs(b, raw);
      if (!s.ok) return s.reason;
      for (let i = 0; i < out.length; i++) out[i] = s.loads[i]! * b.units[i]!.scale + b.units[i]!.offset;
      return undefined;
    },
  };
}
