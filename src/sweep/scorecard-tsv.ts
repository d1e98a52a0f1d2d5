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
 * The TSV column name of a scorecard column: a plain identifier (letters, digits, underscores) that R
 * and pandas read unchanged, e.g. "smooth.fwhmMm" -> "smooth_fwhmMm".
 * @param key - scorecard column or varied parameter key
 * @returns the column name
 * @example scorecardColumnName('drop-initial-volumes.count') // 'drop_initial_volumes_count'
 */
export function scorecardColumnName(key: string): string {
  const name = key.replace(/[^A-Za-z0-9_]/g, '_');
  return /^[A-Za-z]/.test(name) ? name : `x_${name}`;
}

/** What a scorecard TSV does not hold itself (it is kept in sweep.json): the sweep key and the varied parameters. */
export interface ScorecardMeta {
  sweepKey: string;
  varied: string[];
}

/**
 * The facts of a scorecard that sweep.json keeps beside the TSV.
 * @param card - the scorecard
 * @returns sweep key, varied keys and the TSV's column names
 * @example scorecardMeta(result.scorecard).columns
 */
export function scorecardMeta(card: Scorecard): ScorecardMeta & { columns: string[] } {
  return { sweepKey: card.sweepKey, varied: [...card.varied], columns: scorecardColumns(card).map(scorecardColumnName) };
}

/**
 * Write a scorecard as tab-separated text: the column names (plain identifiers, see
 * {@link scorecardColumnName}) on the first line, then one line per row; the sweep key and the
 * varied parameters go to sweep.json ({@link scorecardMeta}). Deterministic: the same scorecard
 * gives the same bytes.
 * @param card - the scorecard
 * @returns TSV text ending in a newline
 * @example await writeFileAtomic('scorecard.tsv', scorecardToTsv(card))
 */
export function scorecardToTsv(card: Scorecard): string {
  const cols = scorecardColumns(card);
  const lines = [cols.map(scorecardColumnName).join('\t')];
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
 * Read a scorecard written by {@link scorecardToTsv} (and optionally its timings). Also reads the
 * earlier layout whose first line was a "# boldsweep scorecard" comment (then `meta` may be null).
 * @param text - scorecard TSV text
 * @param meta - sweep key and varied keys from sweep.json (null: take them from an earlier-layout comment line)
 * @param timingsText - timings TSV text, if any (seconds are NaN without it)
 * @param file - file name for error messages
 * @returns the scorecard
 * @throws BoldsweepError INVALID_ARGUMENT when the text is not a boldsweep scorecard
 * @example const card = readScorecardTsv(readFileSync('out/demo/scorecard.tsv', 'utf8'), sweepJson.scorecard)
 */
export function readScorecardTsv(text: string, meta: ScorecardMeta | null, timingsText?: string, file?: string): Scorecard {
  let lines = text.split('\n').filter((l) => l.length > 0);
  const m = /^# boldsweep scorecard; sweep ([0-9a-f]+); varied (.*)$/.exec(lines[0] ?? '');
  if (m) {
    meta ??= { sweepKey: m[1], varied: m[2] === '(none)' ? [] : m[2].split(',') };
    lines = lines.slice(1);
  }
  if (!meta) fail('INVALID_ARGUMENT', 'the scorecard\'s sweep key and varied parameters are missing (they are kept in sweep.json beside scorecard.tsv)', { file });
  if (lines.length < 1) fail('INVALID_ARGUMENT', 'not a boldsweep scorecard (no header line)', { file });
  const varied = meta.varied;
  const header = lines[0].split('\t');
  const fixed = new Set<string>([...SCORECARD_ID_COLUMNS, ...varied, ...SCORECARD_PLANT_COLUMNS]);
  // column names in the file are identifiers; map the varied keys back to their "<step>.<param>" form
  const byName = new Map<string, string>(varied.map((k) => [scorecardColumnName(k), k]));
  const cols = header.map((c) => byName.get(c) ?? c);
  for (const c of fixed) if (!cols.includes(c)) fail('INVALID_ARGUMENT', `scorecard is missing column "${scorecardColumnName(c)}"`, { file });
  const metrics = cols.filter((c) => !fixed.has(c));
  const rows: ScorecardRow[] = lines.slice(1).map((l, i) => {
    const cells = l.split('\t');
    if (cells.length !== cols.length) fail('INVALID_ARGUMENT', `scorecard line ${i + 2} has ${cells.length} fields, expected ${cols.length}`, { file });
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
  return { sweepKey: meta.sweepKey, varied, metrics, rows, seconds };
}
