// Exact running sums of bigint amounts, kept in a double while every partial sum is a safe integer
// (integer addition in doubles is exact below 2^53) and in a bigint past that. Summing this way
// spares one bigint allocation per addition, which dominates a 150,000-line schedule.
export class MoneySum {
  private small = 0;
  private big: bigint | null = null;

  /** Add x; pass v = Number(x) when it is already at hand, to convert once for several sums. */
  add(x: bigint, v: number = Number(x)): void {
    if (this.big !== null) {
      this.big += x;
      return;
    }
    const s = this.small + v;
    if (Number.isSafeInteger(v) && Number.isSafeInteger(s)) this.small = s;
    else this.big = BigInt(this.small) + x;
  }

  get value(): bigint {
    return this.big ?? BigInt(this.small);
  }
}
