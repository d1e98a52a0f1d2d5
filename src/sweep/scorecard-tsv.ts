import { fail } from '../core/fail.js';
import { scorecardColumns, SCORECARD_ID_COLUMNS, SCORECARD_PLANT_COLUMNS, type Scorecard, type ScorecardRow, type ScorecardValue } from './scorecard.js';

/**
 * Text of one value: numbers in JavaScript's shortest round-trip form (so a value read back is the
 * same double), "n/a" for missing or non-finite values (the BIDS convention for empty cells).
 */
function formatValue(v: ScorecardValue | undefined): string {
  if (v === null || v === undefined) return 'n/a';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : 'n/a';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  if (/[\t\n\r]/.test(v)) return v.replace(/[\t\n\r]+/g, ' ');
  return v;
}

/**
 * Write a scorecard as tab-separated text: a header line with the sweep key, then the column names,
 * then one line per row. Deterministic: the same scorecard gives the same bytes.
 * @param card - the scorecard
 * @returns TSV text ending in a newline
 * @example await writeFileAtomic('scorecard.tsv', scorecardToTsv(card))
 */
export function scorecardToTsv(card: Scorecard): string {
  const cols = scorecardColumns(card);
  const lines = [`# boldsweep scorecard; sweep ${card.sweepKey}; varied ${card.varied.join(',') || '(none)'}`, cols.join('\t')];
  for (const row of card.rows) lines.push(cols.map((c) => formatValue(row[c])).join('\t'));
  return lines.join('\n') + '\n';
}

/**
 * Write the time each cell took (kept out of the scorecard itself so that stays reproducible).
 * @param card - the scorecard
 * @returns TSV text with columns cell, seconds
 * @example await writeFileAtomic('timings.tsv', timingsToTsv(card))
 */
export function timingsToTsv(card: Scorecard): string {
  return ['cell\tseconds', ...card.rows.map((r, i) => `${r.cell}\t${card.seconds[i].toFixed(3)}`)].join('\n') + '\n';
}

function parseValue(text: string): ScorecardValue {
  if (text === 'n/a') return null;
  if (text === 'true') return true;
  if (text === 'false') return false;
  if (text !== '' && /^[-+0-9.eE]+$/.test(text) && !Number.isNaN(Number(text))) return Number(text);
  return text;
}

/**
 * Read a scorecard written by {@link scorecardToTsv} (and optionally its timings).
 * @param text - scorecard TSV text
 * @param timingsText - timings TSV text, if any (seconds are NaN without it)
 * @param file - file name for error messages
 * @returns the scorecard
 * @throws BoldsweepError SPEC_INVALID when the text is not a boldsweep scorecard
 * @example const card = readScorecardTsv(readFileSync('out/demo/scorecard.tsv', 'utf8'))
 */
export function readScorecardTsv(text: string, timingsText?: string, file?: string): Scorecard {
  const lines = text.split('\n').filter((l) => l.length > 0);
  const m = /^# boldsweep scorecard; sweep ([0-9a-f]+); varied (.*)$/.exec(lines[0] ?? '');
  if (!m || lines.length < 2) fail('INVALID_ARGUMENT', 'not a boldsweep scorecard (first line must be "# boldsweep scorecard; sweep <key>; varied <keys>")', { file });
  const varied = m[2] === '(none)' ? [] : m[2].split(',');
  const cols = lines[1].split('\t');
  const fixed = new Set<string>([...SCORECARD_ID_COLUMNS, ...varied, ...SCORECARD_PLANT_COLUMNS]);
  for (const c of fixed) if (!cols.includes(c)) fail('INVALID_ARGUMENT', `scorecard is missing column "${c}"`, { file });
  const metrics = cols.filter((c) => !fixed.has(c));
  const rows: ScorecardRow[] = lines.slice(2).map((l, i) => {
    const cells = l.split('\t');
    if (cells.length !== cols.length) fail('INVALID_ARGUMENT', `scorecard line ${i + 3} has ${cells.length} fields, expected ${cols.length}`, { file });
    const row: ScorecardRow = {};
    cols.forEach((c, j) => { row[c] = parseValue(cells[j]); });
    return row;
  });
  const seconds = rows.map(() => NaN);
  if (timingsText) {
    const byCell = new Map<number, number>();
    for (const l of timingsText.split('\n').slice(1)) {
      const [c, s] = l.split('\t');
      if (c) byCell.set(Number(c), Number(s));
    }
    rows.forEach((r, i) => { seconds[i] = byCell.get(r.cell as number) ?? NaN; });
  }
  return { sweepKey: m[1], varied, metrics, rows, seconds };
}
