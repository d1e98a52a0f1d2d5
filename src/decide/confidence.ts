import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';

/** Mean of repeated measurements with a t-based confidence interval. */
export interface MeanInterval {
  /** Number of finite values used. */
  n: number;
  mean: number;
  /** Sample standard deviation (n - 1 in the denominator). */
  sd: number;
  /** Standard error of the mean, sd / sqrt(n). */
  se: number;
  /** Lower and upper ends of the interval (NaN when n < 2). */
  low: number;
  high: number;
  /** Coverage of the interval, e.g. 0.95. */
  level: number;
}

/**
 * Mean and t-based confidence interval: mean +- t_{(1+level)/2, n-1} * sd / sqrt(n) (Student 1908,
 * Biometrika 6:1-25). Non-finite values (undefined metrics) are left out.
 * @param values - one value per repeat
 * @param level - coverage. __Default value:__ 0.95
 * @returns the summary
 * @example meanInterval([1, 2, 3, 4]) // mean 2.5, se 0.6455, interval 2.5 +- 3.1824 * 0.6455
 */
export function meanInterval(values: ArrayLike<number | null>, level = 0.95): MeanInterval {
  const xs: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v === 'number' && Number.isFinite(v)) xs.push(v);
  }
  const n = xs.length;
  if (n === 0) return { n, mean: NaN, sd: NaN, se: NaN, low: NaN, high: NaN, level };
  let sum = 0;
  for (const x of xs) sum += x;
  const mean = sum / n;
  let ss = 0;
  for (const x of xs) ss += (x - mean) * (x - mean);
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : NaN;
  const se = sd / Math.sqrt(n);
  const half = n > 1 ? tQuantile((1 + level) / 2, n - 1) * se : NaN;
  return { n, mean, sd, se, low: mean - half, high: mean + half, level };
}

/** A proportion with its Wilson score interval. */
export interface ProportionInterval {
  successes: number;
  n: number;
  rate: number;
  low: number;
  high: number;
  level: number;
}

/**
 * Proportion with the Wilson score interval (Wilson EB 1927, J Am Stat Assoc 22:209-212), which
 * keeps sensible bounds when the count is 0 or n, unlike the normal approximation.
 * @param successes - count of events (e.g. repeats with any false alarm)
 * @param n - number of trials
 * @param level - coverage. __Default value:__ 0.95
 * @returns rate and interval
 * @example proportionInterval(5, 100) // rate 0.05, interval about [0.0215, 0.1118]
 */
export function proportionInterval(successes: number, n: number, level = 0.95): ProportionInterval {
  if (n <= 0) return { successes, n, rate: NaN, low: NaN, high: NaN, level };
  const z = normalQuantile((1 + level) / 2, 0, 1);
  const p = successes / n;
  const z2n = (z * z) / n;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / n + z2n / (4 * n));
  return { successes, n, rate: p, low: Math.max(0, centre - half), high: Math.min(1, centre + half), level };
}
