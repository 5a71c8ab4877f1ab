import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { discoverRoutes, exportedNames, urlPathOf } from '../appRoutes';

describe('reading the routes of app/ for the access table', () => {
  it('turns folders into URL paths without route groups or slots', () => {
    const root = path.join('/x', 'app');
    expect(urlPathOf(path.join(root, '(app)', 'runs', '[runId]'), root)).toBe('/runs/[runId]');
    expect(urlPathOf(path.join(root, '(app)', '(home)'), root)).toBe('/');
    expect(urlPathOf(path.join(root, 'api', 'runs', '@modal', 'upload'), root)).toBe('/api/runs/upload');
  });

  it('finds exports written as functions, constants and export lists', () => {
    const source = [
      "'use server';",
      'export async function signIn(a, b) {}',
      'export function GET() {}',
      'export const POST = handler;',
      'export { put as PUT, remove as DELETE };',
      'async function helper() {}',
      'const notExported = 1;',
    ].join('\n');
    expect(exportedNames(source).sort()).toEqual(['DELETE', 'GET', 'POST', 'PUT', 'signIn']);
  });

  it('lists the real app’s pages, handlers and actions', () => {
    const { keys, strayServerFiles } = discoverRoutes();
    expect(keys).toContain('page /runs/[runId]');
    expect(keys).toContain('GET /api/health');
    expect(keys).toContain('action (app)/admin/users#inviteUser');
    expect(keys).not.toContain(expect.stringMatching(/#(formObject|sendResetLink)$/));
    expect(strayServerFiles).toEqual([]);
  });
});
