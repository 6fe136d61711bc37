/**
 * What a text cell of a manifest may hold, and how a cell is quoted in a message.
 *
 * PostgreSQL's text type cannot hold the NUL character (U+0000; PostgreSQL documentation,
 * "Character Types"), and identities and labels (test_id, lab, grade, supplier, heat) are keys of
 * B-tree indexes, whose entries must stay under about a third of a page (2,704 bytes with the
 * default 8 kB page; PostgreSQL documentation, "B-Tree Indexes", from memory). A text cell is
 * therefore at most MAX_TEXT_CHARS characters (1,024 bytes of UTF-8 at most, so lab + test_id
 * stay under the limit together) and holds no NUL; anything else is a rejection naming the cell,
 * never a failed batch.
 */
import type { RejectionCode } from './rejection.ts';

export const MAX_TEXT_CHARS = 256;

export function textProblem(v: string): { code: RejectionCode; message: string } | null {
  if (v.includes('\u0000')) return { code: 'invalid_text', message: `${showCell(v)} contains a NUL character (0x00), which cannot be stored as text` };
  if (v.length > MAX_TEXT_CHARS) return { code: 'value_too_long', message: `${v.length} characters long; at most ${MAX_TEXT_CHARS} are stored` };
  return null;
}

/**
 * A cell as quoted in a message: double-quoted, control characters shown as `\u0000`-style
 * escapes (JSON's), at most 60 characters of it followed by `…`.
 */
export function showCell(raw: string): string {
  const cut = raw.length > 60 ? raw.slice(0, 60) : raw;
  return JSON.stringify(cut).replace(/"$/, raw.length > 60 ? '…"' : '"');
}
