/** The app's routes from the files under src/pages (shared by the access matrix and the API fuzz). */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const PAGES = join(ROOT, 'src/pages');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** Every route the app serves, as "METHOD /path/:param", from the file names and their exports. */
export function discoverRoutes(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = join(dir, name);
      if (statSync(full).isDirectory()) {
        walk(full);
        continue;
      }
      const m = /^(.*)\.(astro|ts|js|mjs)$/.exec(name);
      if (!m) continue;
      const rel = relative(PAGES, join(dir, m[1]!)).split('\\').join('/');
      const path =
        '/' +
        rel
          .split('/')
          .map((seg) => seg.replace(/^\[\.\.\.(.+)\]$/, ':$1*').replace(/\[([^\]]+)\]/g, ':$1'))
          .filter((seg, i, a) => !(seg === 'index' && i === a.length - 1))
          .join('/');
      const clean = path === '/' ? '/' : path.replace(/\/$/, '');
      if (m[2] === 'astro') {
        out.push(`GET ${clean}`);
        continue;
      }
      const src = readFileSync(full, 'utf8');
      const found = METHODS.filter((meth) => new RegExp(`export\\s+(const|async\\s+function|function)\\s+${meth}\\b`).test(src));
      if (/export\s+(const|async\s+function|function)\s+ALL\b/.test(src)) found.push(...METHODS.filter((x) => !found.includes(x)));
      for (const meth of found) out.push(`${meth} ${clean}`);
    }
  };
  walk(PAGES);
  return out.sort();
}

