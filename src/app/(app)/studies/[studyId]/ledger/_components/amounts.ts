import { formatMinor } from "@/lib/money";

/** Amounts arrive from the API as strings of minor units (bigint in JSON). */
export const fmt = (minor: string | bigint, currency: string, withCode = true) => formatMinor(BigInt(minor), currency, { withCode });
