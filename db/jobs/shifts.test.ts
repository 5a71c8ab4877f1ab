import { describe, expect, it } from 'vitest';
import { lastEndedShift, shiftAt, shiftEndCron, shiftEndHourUtc } from './shifts';

const at = (iso: string) => new Date(iso);
const window = (w: { shift: string; from: Date; to: Date }) => ({ shift: w.shift, from: w.from.toISOString(), to: w.to.toISOString() });

// The shop's hours (early 06–14, day 14–22, night 22–06 UTC) written out by hand, not taken from the module.
describe('shift windows', () => {
  it('each shift ends where the next starts; the night shift ends at 06:00 the next morning', () => {
    expect([shiftEndHourUtc('early'), shiftEndHourUtc('day'), shiftEndHourUtc('night')]).toEqual([14, 22, 6]);
    expect([shiftEndCron('early'), shiftEndCron('day'), shiftEndCron('night')]).toEqual(['0 14 * * *', '0 22 * * *', '0 6 * * *']);
  });

  it('the digest at a shift end reports the eight hours just ended, the end exclusive', () => {
    expect(window(lastEndedShift('early', at('2026-09-08T14:00:00Z')))).toEqual({ shift: 'early', from: '2026-09-08T06:00:00.000Z', to: '2026-09-08T14:00:00.000Z' });
    expect(window(lastEndedShift('day', at('2026-09-08T22:00:30Z')))).toEqual({ shift: 'day', from: '2026-09-08T14:00:00.000Z', to: '2026-09-08T22:00:00.000Z' });
  });

  it('the night shift crosses midnight and across a month end', () => {
    expect(window(lastEndedShift('night', at('2026-09-09T06:00:00Z')))).toEqual({ shift: 'night', from: '2026-09-08T22:00:00.000Z', to: '2026-09-09T06:00:00.000Z' });
    expect(window(lastEndedShift('night', at('2026-10-01T06:01:00Z')))).toEqual({ shift: 'night', from: '2026-09-30T22:00:00.000Z', to: '2026-10-01T06:00:00.000Z' });
  });

  it('a job that runs late, or a moment before the end, reports the last shift that ended', () => {
    expect(window(lastEndedShift('early', at('2026-09-08T13:59:59Z')))).toEqual({ shift: 'early', from: '2026-09-07T06:00:00.000Z', to: '2026-09-07T14:00:00.000Z' });
    expect(window(lastEndedShift('night', at('2026-09-09T05:59:59Z')))).toEqual({ shift: 'night', from: '2026-09-07T22:00:00.000Z', to: '2026-09-08T06:00:00.000Z' });
    expect(window(lastEndedShift('night', at('2026-09-09T23:30:00Z')))).toEqual({ shift: 'night', from: '2026-09-08T22:00:00.000Z', to: '2026-09-09T06:00:00.000Z' });
  });

  it('names the shift a moment falls in, at and between the boundaries', () => {
    expect(shiftAt(at('2026-09-08T06:00:00Z')).shift).toBe('early');
    expect(shiftAt(at('2026-09-08T13:59:59Z')).shift).toBe('early');
    expect(shiftAt(at('2026-09-08T14:00:00Z')).shift).toBe('day');
    expect(shiftAt(at('2026-09-08T22:00:00Z')).shift).toBe('night');
    expect(window(shiftAt(at('2026-09-09T02:00:00Z')))).toEqual({ shift: 'night', from: '2026-09-08T22:00:00.000Z', to: '2026-09-09T06:00:00.000Z' });
    expect(window(shiftAt(at('2026-09-09T23:00:00Z')))).toEqual({ shift: 'night', from: '2026-09-09T22:00:00.000Z', to: '2026-09-10T06:00:00.000Z' });
  });

  it('refuses a shift the shop does not have, naming it', () => {
    expect(() => lastEndedShift('swing' as never, at('2026-09-08T14:00:00Z'))).toThrow(/unknown shift "swing"/);
  });
});
