// Exact running sums of bigint amounts, kept in a double while every partial sum is a safe integer
// (integer addition in doubles is exact below 2^53) and in a bigint past that. Summing this way
// spares one bigint allocation per addition, which dominates a 150,000-line schedule.
export class MoneySum {
  private small = 0;
  private big: bigint | null = null;

  /**
   * Add x; pass v = Number(x) when it is already at hand, to convert once for several sums. x may be
   * null when v is a safe integer (the amount exactly).
   */
  add(x: bigint | null, v: number = Number(x)): void {
    if (this.big !== null) {
      this.big += x ?? BigInt(v);
      return;
    }
    const s = this.small + v;
    if (Number.isSafeInteger(v) && Number.isSafeInteger(s)) this.small = s;
    else this.big = BigInt(this.small) + (x ?? BigInt(v));
  }

  get value(): bigint {
    return this.big ?? BigInt(this.small);
  }
}
