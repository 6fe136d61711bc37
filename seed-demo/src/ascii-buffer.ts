/**
 * A growable byte buffer that prints numbers with fixed decimals straight as ASCII digits.
 * Written by hand because curve files are the bulk of the demo's output: printing each number
 * through `toFixed` and joining strings costs several times more than writing digits into one
 * buffer per file.
 *
 * `fixed(x, d)` rounds x·10^d half away from zero (Math.round on |x|) and never prints "-0";
 * non-finite input prints "NaN" / "Infinity" / "-Infinity" like `String(x)`.
 */
const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];

export class AsciiBuffer {
  private buf: Buffer;
  length = 0;
  private digits = new Uint8Array(24);

  constructor(capacity = 1 << 16) {
    this.buf = Buffer.allocUnsafe(capacity);
  }

  private ensure(extra: number): void {
    if (this.length + extra <= this.buf.length) return;
    const next = Buffer.allocUnsafe(Math.max(this.buf.length * 2, this.length + extra));
    this.buf.copy(next, 0, 0, this.length);
    this.buf = next;
  }

  byte(c: number): void {
    this.ensure(1);
    this.buf[this.length++] = c;
  }

  text(s: string): void {
    this.ensure(s.length * 3);
    this.length += this.buf.write(s, this.length, 'utf8');
  }

  /** x with d decimals (0 ≤ d ≤ 9), `point` the decimal mark's character code. */
  fixed(x: number, d: number, point = 0x2e): void {
    if (!Number.isFinite(x)) {
      this.text(String(x));
      return;
    }
    let n = Math.round(Math.abs(x) * POW10[d]);
    this.ensure(d + 24);
    if (x < 0 && n !== 0) this.buf[this.length++] = 0x2d;
    let k = 0;
    if (n >= 2 ** 53) {
      this.text(String(x < 0 ? -n : n));
      return;
    }
    do {
      const q = Math.floor(n / 10);
      this.digits[k++] = 0x30 + (n - q * 10);
      n = q;
    } while (n > 0);
    while (k <= d) this.digits[k++] = 0x30;
    for (let i = k - 1; i >= 0; i--) {
      if (i === d - 1) this.buf[this.length++] = point;
      this.buf[this.length++] = this.digits[i];
    }
  }

  bytes(): Buffer {
    return this.buf.subarray(0, this.length);
  }

  reset(): void {
    this.length = 0;
  }
}
