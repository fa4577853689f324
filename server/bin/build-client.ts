import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { rootDir, dataDir } from '../config.js';

function newest(p: string): number {
  if (!existsSync(p)) return 0;
  const s = statSync(p);
  if (!s.isDirectory()) return s.mtimeMs;
  let m = s.mtimeMs;
  for (const e of readdirSync(p)) m = Math.max(m, newest(path.join(p, e)));
  return m;
}

/** Builds the Vue client into .data/client when it is missing or older than its sources. */
export async function ensureClientBuilt(log: (msg: string) => void = console.log): Promise<void> {
  const index = path.join(dataDir, 'client', 'index.html');
  const sources = ['src', 'shared', 'index.html', 'vite.config.ts', 'package-lock.json'].map((p) => newest(path.join(rootDir, p)));
  if (existsSync(index) && statSync(index).mtimeMs >= Math.max(...sources)) return;
  log('building the client (vite build)');
  const { build } = await import('vite');
  await build({ root: rootDir, configFile: path.join(rootDir, 'vite.config.ts'), logLevel: 'warn', mode: 'production' });
}
