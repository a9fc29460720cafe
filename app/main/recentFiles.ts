/**
 * The recent-files list of the desktop app, kept as JSON in the user-data folder. Newest first,
 * at most RECENT_LIMIT entries, one per path. A missing or unreadable list reads as empty.
 */
import { basename } from 'node:path';
import type { RecentEntry } from '../preload/api.ts';

export const RECENT_LIMIT = 10;

export interface RecentFs {
  readText(path: string): Promise<string>;
  writeAtomic(path: string, text: string): Promise<void>;
}

export interface RecentStore {
  list(): Promise<RecentEntry[]>;
  add(path: string, at?: number): Promise<RecentEntry[]>;
  has(path: string): Promise<boolean>;
}

function isEntry(x: unknown): x is RecentEntry {
  const e = x as RecentEntry;
  return typeof e === 'object' && e !== null && typeof e.path === 'string' && typeof e.name === 'string' && typeof e.at === 'number';
}

export function createRecentStore(file: string, fs: RecentFs): RecentStore {
  let cache: RecentEntry[] | null = null;
  async function load(): Promise<RecentEntry[]> {
    if (cache) return cache;
    try {
      const raw: unknown = JSON.parse(await fs.readText(file));
      cache = Array.isArray(raw) ? raw.filter(isEntry).slice(0, RECENT_LIMIT) : [];
    } catch {
      cache = [];
    }
    return cache;
  }
  return {
    list: async () => [...(await load())],
    async add(path, at = Date.now()) {
      const next = [{ path, name: basename(path), at }, ...(await load()).filter((e) => e.path !== path)].slice(0, RECENT_LIMIT);
      cache = next;
      await fs.writeAtomic(file, `${JSON.stringify(next, null, 2)}\n`);
      return [...next];
    },
    has: async (path) => (await load()).some((e) => e.path === path),
  };
}
