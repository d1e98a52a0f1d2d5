/**
 * Quote a word for a POSIX shell (single quotes; a single quote inside becomes '\'').
 * @param word - any text
 * @returns the word, safe to paste into a shell command line
 * @example shellQuote("it's") // 'it'\''s'
 */
export function shellQuote(word: string): string {
  if (/^[A-Za-z0-9_@%+=:,./-]+$/.test(word)) return word;
  return `'${word.replace(/'/g, `'\\''`)}'`;
}
