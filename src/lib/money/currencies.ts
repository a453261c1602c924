// ISO 4217 minor units (number of decimals) of the currencies Cairn supports.
// Our own table: runtime code never reads a currency package; tests compare it with one.
// Intl.NumberFormat is not a source either (it disagrees with ISO 4217 for HUF and others).
export const MINOR_UNITS = {
  EUR: 2,
  USD: 2,
  GBP: 2,
  CHF: 2,
  JPY: 0,
  KRW: 0,
  SEK: 2,
  NOK: 2,
  DKK: 2,
  PLN: 2,
  CZK: 2,
  HUF: 2,
  CAD: 2,
  AUD: 2,
  NZD: 2,
  KWD: 3,
  BHD: 3,
  JOD: 3,
  OMR: 3,
  TND: 3,
  ISK: 0,
  CLP: 0,
} as const;

export type CurrencyCode = keyof typeof MINOR_UNITS;
export const SUPPORTED_CURRENCIES = Object.keys(MINOR_UNITS) as CurrencyCode[];

export function isSupportedCurrency(code: string): code is CurrencyCode {
  return Object.prototype.hasOwnProperty.call(MINOR_UNITS, code);
}

export function minorUnits(code: string): number {
  if (!isSupportedCurrency(code)) throw new Error(`Currency ${code} is not supported by Cairn`);
  return MINOR_UNITS[code];
}

/** 10^(minor units) as a bigint: the number of minor units in one major unit. */
export function minorPerMajor(code: string): bigint {
  return 10n ** BigInt(minorUnits(code));
}
