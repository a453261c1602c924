// Split an amount in proportion to weights so the parts add up exactly (largest remainder method).

/**
 * Parts are floor(total × wᵢ / Σw); the minor units left over go one each to the parts with the
 * largest remainders, earlier parts first on ties. A negative total is split as its opposite.
 */
export function allocateLargestRemainder(totalMinor: bigint, weights: ReadonlyArray<number | bigint>): bigint[] {
  if (weights.length === 0) throw new RangeError("Give at least one weight to allocate an amount");
  const w = weights.map((x) => {
    if (typeof x === "number" && !Number.isInteger(x)) throw new RangeError(`Weights must be whole numbers, got ${x}`);
    const b = BigInt(x);
    if (b < 0n) throw new RangeError("Weights cannot be negative");
    return b;
  });
  const sum = w.reduce((a, b) => a + b, 0n);
  if (sum === 0n) throw new RangeError("Weights must not all be zero");
  if (totalMinor < 0n) return allocateLargestRemainder(-totalMinor, w).map((p) => -p);

  const parts = w.map((x) => (totalMinor * x) / sum);
  const remainders = w.map((x, i) => ({ i, r: (totalMinor * x) % sum }));
  let left = totalMinor - parts.reduce((a, b) => a + b, 0n);
  remainders.sort((a, b) => (a.r === b.r ? a.i - b.i : a.r > b.r ? -1 : 1));
  for (const { i } of remainders) {
    if (left === 0n) break;
    parts[i] = (parts[i] as bigint) + 1n;
    left -= 1n;
  }
  return parts;
}
