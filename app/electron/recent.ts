/** Recently used campaigns, newest first, kept in the user's app-data folder. */
import { readFile } from 'node:fs/promises';
import { writeFileAtomic } from '../files/atomic.ts';

export interface RecentList {
  list(): Promise<string[]>;
  add(path: string): Promise<void>;
}

export function recentList(file: string, max = 10): RecentList {
  const list = async (): Promise<string[]> => {
    try {
      const v = JSON.parse(await readFile(file, 'utf8')) as unknown;
      return Array.isArray(v) ? v.filter((x): x is string => typeof x === 'string').slice(0, max) : [];
    } catch {
      return [];
    }
  };
  return {
    list,
    add: async (path) => {
      if (path.includes('sample-runs')) return;
      const next = [path, ...(await list()).filter((p) => p !== path)].slice(0, max);
      await writeFileAtomic(file, JSON.stringify(next, null, 2));
    },
  };
}
