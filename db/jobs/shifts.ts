// The shop's shifts, in one place: their names (as the trace files and the demo history write
// them), when each starts, and the cron of each shift's end that schedules its digest e-mail.
// Pure (no I/O), so the window arithmetic is unit-tested on its own.

export type ShiftName = 'early' | 'day' | 'night';

/**
 * Larkspur Optical Works runs three eight-hour shifts, in UTC (the demo history starts its runs
 * at these hours, analysis/synth/shopHistory.ts). The night shift crosses midnight. A shop with
 * other hours changes `startHourUtc` here; each shift ends where the next one starts.
 */
export const SHIFTS: readonly { name: ShiftName; startHourUtc: number }[] = [
  { name: 'early', startHourUtc: 6 },
  { name: 'day', startHourUtc: 14 },
  { name: 'night', startHourUtc: 22 },
];

export const SHIFT_TIME_ZONE = 'UTC';

const HOUR = 3600e3;
const DAY = 24 * HOUR;

function shiftIndex(name: ShiftName): number {
  const i = SHIFTS.findIndex((s) => s.name === name);
  if (i < 0) throw new Error(`unknown shift "${String(name)}": expected one of ${SHIFTS.map((s) => s.name).join(', ')}`);
  return i;
}

/** Hours from a shift's start to the next shift's start (the night shift wraps past midnight). */
function lengthHours(i: number): number {
  const start = SHIFTS[i].startHourUtc;
  const next = SHIFTS[(i + 1) % SHIFTS.length].startHourUtc;
  return (next - start + 24) % 24 || 24;
}

/** The hour (UTC) a shift ends. */
export function shiftEndHourUtc(name: ShiftName): number {
  const i = shiftIndex(name);
  return (SHIFTS[i].startHourUtc + lengthHours(i)) % 24;
}

/** The cron of a shift's end (minute 0 of its end hour, every day), for pg-boss `schedule` in SHIFT_TIME_ZONE. */
export function shiftEndCron(name: ShiftName): string {
  return `0 ${shiftEndHourUtc(name)} * * *`;
}

export type ShiftWindow = { shift: ShiftName; from: Date; to: Date };

/**
 * The latest whole instance of a shift that ended at or before `at`: [from, to), `to` on the hour
 * the shift ends. A digest job that runs a little late still reports the shift that just ended.
 */
export function lastEndedShift(name: ShiftName, at: Date): ShiftWindow {
  const i = shiftIndex(name);
  const endHour = shiftEndHourUtc(name);
  const midnight = Math.floor(at.getTime() / DAY) * DAY;
  let to = midnight + endHour * HOUR;
  if (to > at.getTime()) to -= DAY;
  return { shift: name, from: new Date(to - lengthHours(i) * HOUR), to: new Date(to) };
}

/** The shift a moment falls in, and that instance's window. */
export function shiftAt(at: Date): ShiftWindow {
  const hour = (at.getTime() % DAY) / HOUR;
  for (let k = 0; k < SHIFTS.length; k++) {
    const i = SHIFTS.length - 1 - k;
    if (hour >= SHIFTS[i].startHourUtc) return windowStartingBefore(i, at);
  }
  // Before the first start of the day: the last shift of the day before (the night shift).
  return windowStartingBefore(SHIFTS.length - 1, at);
}

function windowStartingBefore(i: number, at: Date): ShiftWindow {
  const midnight = Math.floor(at.getTime() / DAY) * DAY;
  let from = midnight + SHIFTS[i].startHourUtc * HOUR;
  if (from > at.getTime()) from -= DAY;
  return { shift: SHIFTS[i].name, from: new Date(from), to: new Date(from + lengthHours(i) * HOUR) };
}

export function isShiftName(v: unknown): v is ShiftName {
  return SHIFTS.some((s) => s.name === v);
}
