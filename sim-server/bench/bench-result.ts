/** One measured benchmark figure, as `npm run bench` prints it and the README records it. */
export interface BenchResult {
  name: string;
  /** The median of the runs (or the measured count, for a capacity figure). */
  median: number;
  unit: string;
  runs: number;
  /** The goal the issue set, in words (e.g. "< 100 µs"). */
  goal?: string;
}
