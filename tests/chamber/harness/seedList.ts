/** Seeds from the command line: "15-30" (a range), "15,17,21" (a list), or the fallback. */
export function seedList(arg: string | undefined, fallback: number[]): number[] {
  if (!arg) return fallback;
  const range = /^(\d+)-(\d+)$/.exec(arg);
  if (range) return Array.from({ length: Number(range[2]) - Number(range[1]) + 1 }, (_, i) => Number(range[1]) + i);
  return arg.split(',').map(Number);
}
