/** Labels of the class-robustness flags (class-robustness.ts; band robustnessFlags). */
const FLAG_NAMES: [number, string][] = [
  [1, 'fluid limit warmer'],
  [2, 'fluid limit colder'],
  [4, 'COP lower'],
  [8, 'COP higher'],
  [16, 'a weight doubled or halved'],
];

/** Plain text of a flags sum ("none" for 0). */
export function robustnessText(flags: number): string {
  if (flags === 0) return 'none';
  return FLAG_NAMES.filter(([b]) => (flags & b) !== 0)
    .map(([, t]) => t)
    .join(', ');
}

/** Class labels of every flag sum 0..31 (band robustnessFlags). */
export const ROBUSTNESS_LABELS = Array.from({ length: 32 }, (_, v) => ({
  value: v,
  label: v === 0 ? 'none: robust' : `changes with: ${robustnessText(v)}`,
}));
