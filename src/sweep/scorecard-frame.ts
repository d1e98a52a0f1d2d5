import type { DataFrame } from 'danfojs';
import { scorecardColumns, type Scorecard } from './scorecard.js';

/**
 * The scorecard as a danfo.js DataFrame (one row per cell, plus a `seconds` column), for filtering and
 * grouping in a notebook. danfo.js is loaded on first use only: it is large and the sweep does not need it.
 * @param card - the scorecard
 * @returns the DataFrame
 * @example const df = await scorecardFrame(card); df.groupby(['smooth.fwhmMm']).col(['hitRate']).mean().print()
 */
export async function scorecardFrame(card: Scorecard): Promise<DataFrame> {
  const dfd = await import('danfojs');
  const cols = scorecardColumns(card);
  const data = card.rows.map((r, i) => [...cols.map((c) => (r[c] === null ? NaN : r[c])), card.seconds[i]]);
  return new dfd.DataFrame(data, { columns: [...cols, 'seconds'] });
}
