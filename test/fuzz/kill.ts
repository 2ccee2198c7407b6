/**
 * Crash-safety test of campaign saves: a child process (test/fuzz/save-child.ts) saves a
 * campaign repeatedly and is killed with SIGKILL at a random moment; afterwards the campaign file must
 * parse (core/campaign.ts) and be exactly the old or the new version, and the backup must parse too.
 * The next save, by the next child, must clean up the temp files the killed one left behind.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeFileAtomic } from '../../app/files/atomic.ts';
import { parseCampaign } from '../../core/formats/campaign.ts';
import { CAMPAIGN_VERSIONS } from './campaign-versions.ts';
import { ROOT } from './inputs.ts';
import { uniform as prng } from '../support/random.ts';

const CHILD = fileURLToPath(new URL('./save-child.ts', import.meta.url));

export interface KillOptions {
  kills: number;
  seed: number;
  /** Kills fall uniformly in [0, maxDelayMs] after the child reports it is about to save. */
  maxDelayMs: number;
}

export interface KillResult {
  seed: number;
  kills: number;
  /** After the kill the campaign was the old (A) or new (B) version. */
  campaignOld: number;
  campaignNew: number;
  /** Kills that left a temp file behind, i.e. that landed inside a save. */
  midSave: number;
  /** Saves the children completed before their kill, in total. */
  savesCompleted: number;
  unreadable: number;
  backupUnreadable: number;
  /** Most temp files seen beside the campaign after any kill (each new save removes the dead writers' ones). */
  maxTempFiles: number;
  /** Temp files left after one clean save at the end (must be 0). */
  tempFilesAtEnd: number;
  failures: string[];
}


const temps = (dir: string) => readdirSync(dir).filter((n) => n.endsWith('.tmp'));

/** Which version a campaign text is, or why it is not one of them. */
function judge(path: string): 'old' | 'new' | string {
  if (!existsSync(path)) return 'missing';
  const text = readFileSync(path, 'utf8');
  try {
    parseCampaign(path, text);
  } catch (err) {
    return `does not parse (${(err as Error).message.slice(0, 120)}; ${text.length} characters)`;
  }
  if (text === CAMPAIGN_VERSIONS[0]) return 'old';
  if (text === CAMPAIGN_VERSIONS[1]) return 'new';
  return `parses but is neither version (${text.length} characters)`;
}

/** One child: start, wait for "ready", wait the delay, SIGKILL (by its pid), wait for it to end. */
function killOnce(dir: string, delayMs: number): Promise<{ saves: number; error?: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', CHILD, dir], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    let timer: NodeJS.Timeout | undefined;
    const startup = setTimeout(() => child.kill('SIGKILL'), 60_000);
    child.stdout.on('data', (d: Buffer) => {
      out += d.toString();
      if (timer === undefined && out.includes('ready\n')) {
        clearTimeout(startup);
        timer = setTimeout(() => child.kill('SIGKILL'), delayMs);
      }
    });
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    child.on('exit', (code, signal) => {
      clearTimeout(startup);
      if (timer) clearTimeout(timer);
      const saves = (out.match(/^saved \d+$/gm) ?? []).length;
      if (signal !== 'SIGKILL') resolve({ saves, error: `the saving process ended by itself (code ${code}): ${err.trim().slice(-400)}` });
      else if (!out.includes('ready\n')) resolve({ saves, error: 'the saving process did not start within 60 s' });
      else resolve({ saves });
    });
  });
}

export async function killTest(o: KillOptions, onProgress?: (done: number) => void): Promise<KillResult> {
  const res: KillResult = {
    seed: o.seed,
    kills: 0,
    campaignOld: 0,
    campaignNew: 0,
    midSave: 0,
    savesCompleted: 0,
    unreadable: 0,
    backupUnreadable: 0,
    maxTempFiles: 0,
    tempFilesAtEnd: 0,
    failures: [],
  };
  const rnd = prng(o.seed);
  const dir = mkdtempSync(join(tmpdir(), 'sweepbook-kill-'));
  const file = join(dir, 'campaign.json');
  try {
    await writeFileAtomic(file, CAMPAIGN_VERSIONS[0]); // the campaign as it was before the session
    for (let k = 0; k < o.kills; k++) {
      const delay = rnd() * o.maxDelayMs;
      const run = await killOnce(dir, delay);
      res.kills++;
      res.savesCompleted += run.saves;
      if (run.error) res.failures.push(`kill ${k}: ${run.error}`);
      const main = judge(file);
      if (main === 'old') res.campaignOld++;
      else if (main === 'new') res.campaignNew++;
      else {
        res.unreadable++;
        res.failures.push(`kill ${k} (after ${delay.toFixed(1)} ms, seed ${o.seed}): the campaign file ${main}`);
      }
      // the backup exists once a save got past step 3; whenever it exists it must be a whole version
      if (existsSync(`${file}.bak`)) {
        const bak = judge(`${file}.bak`);
        if (bak !== 'old' && bak !== 'new') {
          res.backupUnreadable++;
          res.failures.push(`kill ${k} (after ${delay.toFixed(1)} ms, seed ${o.seed}): the backup ${bak}`);
        }
      }
      const left = temps(dir).length;
      if (left > 0) res.midSave++;
      res.maxTempFiles = Math.max(res.maxTempFiles, left);
      onProgress?.(res.kills);
    }
    // one clean save: it must remove what the killed writers left behind
    await writeFileAtomic(file, CAMPAIGN_VERSIONS[1], { backup: true });
    res.tempFilesAtEnd = temps(dir).length;
    if (res.tempFilesAtEnd > 0) res.failures.push(`temp files left after a clean save: ${temps(dir).join(', ')}`);
    if (judge(file) !== 'new') res.failures.push('the clean save at the end did not leave the new version');
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return res;
}
