// Every page, route handler and server action of app/, read from the filesystem, so a new one
// without a row in the access table fails the suite.
import fs from 'node:fs';
import path from 'node:path';

const appDir = path.resolve(import.meta.dirname, '..', '..', 'app');
const METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'];

function walk(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = path.join(dir, e.name);
    if (e.isDirectory()) return e.name === '__tests__' || e.name.startsWith('_') ? [] : walk(full);
    return [full];
  });
}

/** The URL path of a folder under app/: route groups "(x)" and parallel slots "@x" leave no segment. */
export function urlPathOf(folder: string, root = appDir): string {
  const segments = path
    .relative(root, folder)
    .split(path.sep)
    .filter((s) => s && !/^\(.*\)$/.test(s) && !s.startsWith('@'));
  return `/${segments.join('/')}`;
}

/** Exported function names of a module's source (`export async function x`, `export const x =`). */
export function exportedNames(source: string): string[] {
  const names = new Set<string>();
  for (const m of source.matchAll(/^export\s+(?:async\s+)?function\s+(\w+)/gm)) names.add(m[1]);
  for (const m of source.matchAll(/^export\s+const\s+(\w+)\s*=/gm)) names.add(m[1]);
  for (const m of source.matchAll(/^export\s*\{([^}]*)\}/gm)) {
    for (const part of m[1].split(',')) {
      const name = part.trim().split(/\s+as\s+/).pop()?.trim();
      if (name) names.add(name);
    }
  }
  return [...names];
}

export type Discovered = { keys: string[]; strayServerFiles: string[] };

/**
 * Keys as the access table writes them: `page /runs/[runId]`, `GET /api/health`,
 * `action (app)/admin/users#inviteUser` (the folder of actions.ts under app/, then the export).
 */
export function discoverRoutes(): Discovered {
  const keys: string[] = [];
  const strayServerFiles: string[] = [];
  for (const file of walk(appDir)) {
    const base = path.basename(file);
    const source = () => fs.readFileSync(file, 'utf8');
    if (/^page\.(tsx|ts|jsx|js)$/.test(base)) keys.push(`page ${urlPathOf(path.dirname(file))}`);
    else if (/^route\.(ts|js)$/.test(base)) {
      for (const name of exportedNames(source()).filter((n) => METHODS.includes(n))) keys.push(`${name} ${urlPathOf(path.dirname(file))}`);
    } else if (/^actions\.(ts|js)$/.test(base)) {
      const folder = path.relative(appDir, path.dirname(file)).split(path.sep).join('/');
      for (const name of exportedNames(source())) keys.push(`action ${folder}#${name}`);
    } else if (/\.(ts|tsx)$/.test(base) && /^\s*['"]use server['"]/.test(source())) {
      strayServerFiles.push(path.relative(appDir, file));
    }
  }
  return { keys: keys.sort(), strayServerFiles };
}
