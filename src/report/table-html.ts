import { escapeHtml } from './html-escape.js';

/** Options of {@link tableHtml}. */
export interface TableHtmlOptions {
  /** Columns to show, in order (default all). */
  columns?: string[];
  /** Decimals for non-integer numbers: one for all columns, or per column (default 3). */
  digits?: number | Record<string, number>;
  /** Most rows shown; a last row says how many were left out (default all). */
  maxRows?: number;
}

/**
 * A table as formatted HTML for a notebook or a page: header row, numbers right-aligned with a fixed
 * number of decimals (integers as they are, NaN and null as n/a), text escaped. Takes an array of
 * records or a danfo.js DataFrame (anything with `columns` and `values`).
 * @param table - records, or { columns, values }
 * @param options - columns, digits, maxRows
 * @returns HTML markup (a <table> with its own small style)
 * @example tslab.display.html(tableHtml(await scorecardFrame(result.scorecard), { digits: { hitRate: 2 } }))
 */
export function tableHtml(table: ReadonlyArray<Record<string, unknown>> | { columns: string[]; values: unknown[][] }, options: TableHtmlOptions = {}): string {
  let columns: string[];
  let rows: unknown[][];
  if (Array.isArray(table)) {
    const records = table as ReadonlyArray<Record<string, unknown>>;
    columns = options.columns ?? [...new Set(records.flatMap((r) => Object.keys(r)))];
    rows = records.map((r) => columns.map((c) => r[c]));
  } else {
    const t = table as { columns: string[]; values: unknown[][] };
    const all = t.columns;
    columns = options.columns ?? all;
    const idx = columns.map((c) => all.indexOf(c));
    rows = t.values.map((r) => idx.map((i) => (i >= 0 ? r[i] : undefined)));
  }
  const digitsOf = (c: string) => (typeof options.digits === 'number' ? options.digits : options.digits?.[c] ?? 3);
  const shown = options.maxRows !== undefined ? rows.slice(0, options.maxRows) : rows;
  const cell = (x: unknown, c: string): string => {
    if (x === null || x === undefined || (typeof x === 'number' && !Number.isFinite(x))) return '<td class="num">n/a</td>';
    if (typeof x === 'number') return `<td class="num">${Number.isInteger(x) ? String(x) : x.toFixed(digitsOf(c))}</td>`;
    return `<td>${escapeHtml(String(x))}</td>`;
  };
  const style = '<style>.bs-table{border-collapse:collapse;font-size:13px}.bs-table th,.bs-table td{padding:3px 8px;border-bottom:1px solid #e4e4e4;text-align:left;vertical-align:top}.bs-table td.num{text-align:right;font-variant-numeric:tabular-nums}</style>';
  const more = rows.length > shown.length ? `<tr><td colspan="${columns.length}">... ${rows.length - shown.length} more rows</td></tr>` : '';
  return `${style}<table class="bs-table"><thead><tr>${columns.map((c) => `<th>${escapeHtml(c)}</th>`).join('')}</tr></thead><tbody>${shown.map((r) => `<tr>${r.map((x, i) => cell(x, columns[i])).join('')}</tr>`).join('')}${more}</tbody></table>`;
}
