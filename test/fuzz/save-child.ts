/**
 * A process that saves a campaign over and over, alternating between two versions, the way the desktop
 * application saves (app/files/atomic.ts, with a backup), until it is killed. Usage:
 *   node --import tsx test/fuzz/save-child.ts DIR
 * Prints "ready" before the first save and "saved N" after each.
 */
import { join } from 'node:path';
import { writeFileAtomic } from '../../app/files/atomic.ts';
import { CAMPAIGN_VERSIONS } from './campaign-versions.ts';

const file = join(process.argv[2]!, 'campaign.json');
process.stdout.write('ready\n');
for (let i = 0; ; i++) {
  await writeFileAtomic(file, CAMPAIGN_VERSIONS[(i + 1) % 2]!, { backup: true });
  process.stdout.write(`saved ${i + 1}\n`);
}
