import { describe, expect, it } from 'vitest';
import { killTest } from './kill.ts';

/**
 * Crash-safe campaign saves, the quick version of `npm run fuzz`'s 200 kills: a process saving
 * a campaign in a loop is killed with SIGKILL at random moments; the campaign must always be exactly the
 * old or the new version and its backup a whole version too.
 */
describe('a campaign survives its saving process being killed', () => {
  it('20 kills at random moments: the campaign parses and is the old or the new version, the backup parses', { timeout: 180_000 }, async () => {
    const r = await killTest({ kills: 20, seed: 7, maxDelayMs: 40 });
    const why = JSON.stringify(r, null, 1);
    expect(r.kills).toBe(20);
    expect(r.failures, why).toEqual([]);
    expect(r.unreadable + r.backupUnreadable, why).toBe(0);
    expect(r.campaignOld + r.campaignNew).toBe(20);
    // the kills land inside saves (a temp file was left), and the next save cleans up after the dead writer
    expect(r.midSave, why).toBeGreaterThan(0);
    expect(r.maxTempFiles, why).toBeLessThanOrEqual(2);
    expect(r.tempFilesAtEnd).toBe(0);
  });
});
