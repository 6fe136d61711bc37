/**
 * float8[] array literals (`{v0,v1,…}`, PostgreSQL documentation, "Arrays": Array Value Input)
 * for COPY, built in chunks: the elements are joined a few thousand at a time, so a curve of
 * millions of points never holds one string per point (2,000,000 cells of three channels kept as
 * separate strings took about 300 MB; the chunks take the literal's own size).
 *
 * Numbers use JavaScript's shortest round-trip form (exact for float8); -0 keeps its sign; the
 * values are finite (the readers reject anything else).
 */

const CHUNK = 4096;

export class ArrayLiteralBuilder {
  private chunks: string[] = [];
  private cells: string[] = [];

  /** Appends one element, as the text float8 input reads. */
  push(cell: string): void {
    this.cells.push(cell);
    if (this.cells.length === CHUNK) {
      this.chunks.push(this.cells.join(','));
      this.cells = [];
    }
  }

  /** The literal; the builder is empty afterwards. */
  finish(): string {
    if (this.cells.length) this.chunks.push(this.cells.join(','));
    const s = '{' + this.chunks.join(',') + '}';
    this.chunks = [];
    this.cells = [];
    return s;
  }
}

/** The text of one value as float8 input reads it back exactly. */
export const float8Text = (v: number): string => (v === 0 && 1 / v < 0 ? '-0' : String(v));

/** `{v0,v1,…}` of a finite Float64Array. */
export function float8ArrayLiteral(a: Float64Array): string {
  const b = new ArrayLiteralBuilder();
  for (let i = 0; i < a.length; i++) b.push(float8Text(a[i]));
  return b.finish();
}
