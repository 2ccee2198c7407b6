import type { Channel } from '../../formats/channels.ts';
import { InputError } from '../../contract/messages.ts';
import { missingChannelMessage } from '../../formats/columnMap.ts';
import type { Setup } from '../../setup/schema.ts';
import type { Stage } from '../context.ts';

/**
 * Required columns: the angle, a dynamic-pressure source (dp_pitot, q or dp_contraction), the balance's loads in its axes, and the ambient
 * readings the setup does not give (docs/data-format.md, run file and setup). Stops with a message
 * naming the header line and what to change.
 */
export const columnsStage: Stage = {
  name: 'required columns',
  source: 'data contract (docs/data-format.md)',
  run(ctx) {
    const { run, setup, has } = ctx;
    const missing = (ch: string, why: string): never => {
      // every column of the file with the closest matches, so a column map can be written from the message
      throw new InputError({ file: run.file, line: run.headerLine, message: missingChannelMessage(ch, why, run.headerCells ?? []) });
    };
    if (!has('alpha')) missing('alpha', 'angle of attack');
    if (!has('dp_pitot') && !has('q') && !has('dp_contraction')) missing('dp_pitot', 'pitot-static impact pressure; or "q", the dynamic pressure as the facility logs it, or "dp_contraction" with flow.contraction_factor');
    if (setup.balance.axes === 'wind') {
      for (const ch of ['lift', 'drag'] as const) {
        if (!has(ch)) missing(ch, has('normal') && has('axial') ? 'the setup says balance.axes "wind", but the file has normal/axial columns: set balance.axes to "body"' : 'the setup says balance.axes "wind"');
      }
    } else {
      for (const ch of ['normal', 'axial'] as const) {
        if (!has(ch)) missing(ch, has('lift') && has('drag') ? 'the setup says balance.axes "body", but the file has lift/drag columns: set balance.axes to "wind"' : 'the setup says balance.axes "body"');
      }
    }
    const ambient: [Channel, keyof Setup['ambient'], string][] = [
      ['p_static', 'p_pa', 'static pressure'],
      ['t_total', 't_c', 'stagnation temperature'],
      ['rh', 'rh_pct', 'relative humidity'],
    ];
    for (const [ch, key, what] of ambient) {
      if (!has(ch) && setup.ambient[key] === undefined) {
        throw new InputError({
          field: `ambient.${key}`,
          file: run.file,
          line: run.headerLine,
          message: `the run has no "${ch}" column, so the setup must give the ${what} as ambient.${key}`,
        });
      }
    }
  },
};
