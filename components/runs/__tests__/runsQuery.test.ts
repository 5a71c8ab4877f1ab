import { describe, expect, it } from 'vitest';
import { fromSearchParams, toQueryString } from '../runsQuery';

describe('the runs list query string', () => {
  it('keeps known keys in one order and drops blanks and defaults, so equal filters give equal URLs', () => {
    expect(toQueryString({ state: 'done', design: 'AR', page: '1', sort: '-startedAt', shift: ' ' })).toBe('design=AR&state=done');
    expect(toQueryString({ page: '3', sort: 'runCode', flagged: 'true' })).toBe('flagged=true&sort=runCode&page=3');
  });

  it('reads the first value of each known key from the page search params and ignores others', () => {
    expect(fromSearchParams({ chamber: ['Bay 1 e-beam', 'Bay 2 IAD'], junk: 'x', page: '2' })).toEqual({ chamber: 'Bay 1 e-beam', page: '2' });
  });
});
