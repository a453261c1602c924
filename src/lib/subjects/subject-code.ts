import { z } from "zod";

// Pseudonymous subject codes only (DESIGN.md capability 4: no names, no birth dates).
// Format: <SITECODE>-<3 to 5 digits>, e.g. site "DE01" → "DE01-007".
// A site code is 2 capital letters followed by 1–6 capitals or digits, at least one a digit
// ("DE01", "JP03", "FRA2"), so a site code can never be a word or a name.

const SITE_CODE = /^[A-Z]{2}[A-Z0-9]{1,6}$/;
const SUBJECT_CODE = /^([A-Z]{2}[A-Z0-9]{1,6})-(\d{3,5})$/;

// Dates in the usual written forms: 2024-02-29, 29.02.2024, 02/29/24, 20240229, 29 Feb 1980.
const DATE_LIKE = [
  /\b(19|20)\d{2}[-./](0?[1-9]|1[0-2])[-./](0?[1-9]|[12]\d|3[01])\b/,
  /\b(0?[1-9]|[12]\d|3[01])[-./](0?[1-9]|1[0-2])[-./](\d{2}|\d{4})\b/,
  /\b(0?[1-9]|1[0-2])[-./](0?[1-9]|[12]\d|3[01])[-./](\d{2}|\d{4})\b/,
  /(^|\D)(19|20)\d{2}(0[1-9]|1[0-2])(0[1-9]|[12]\d|3[01])(\D|$)/,
  /(^|\D)(0[1-9]|[12]\d|3[01])(0[1-9]|1[0-2])(19|20)\d{2}(\D|$)/,
  /\b\d{1,2}\s*(jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)[a-z]*\.?\s*\d{2,4}\b/i,
  /\b(jan|feb|mar|apr|may|jun|jul|aug|sep|oct|nov|dec)[a-z]*\.?\s+\d{1,2},?\s+\d{2,4}\b/i,
];

export function looksLikeDate(value: string): boolean {
  return DATE_LIKE.some((re) => re.test(value));
}

/**
 * Words of letters, as names are written: a capitalised or lower-case word of 2+ letters
 * ("Anna", "smith", "O'Neill", "Müller"), or several words separated by spaces or commas.
 */
export function looksLikePersonalName(value: string): boolean {
  const v = value.trim();
  if (/\p{L}{2,}[\s,]+\p{L}{2,}/u.test(v)) return true; // two words: "Anna Berg", "Berg, Anna"
  if (/\p{Ll}{2,}/u.test(v)) return true; // lower-case letters never appear in a code
  if (/[^\x00-\x7F]/.test(v) && /\p{L}/u.test(v)) return true; // accented letters: "MÜLLER"
  if (/\p{L}['’]\p{L}/u.test(v)) return true; // "O'NEILL"
  // A run of 3+ capitals after the dash: "DE01-ANNA" or a bare word "BERG".
  if (/-[A-Z]{2,}/.test(v) || /^[A-Z]{3,}$/.test(v)) return true;
  return false;
}

export const siteCodeSchema = z
  .string()
  .trim()
  .regex(SITE_CODE, "Site code: 2 capital letters then 1–6 capitals or digits, e.g. DE01")
  .refine((s) => /\d/.test(s), "Site code must contain a digit, e.g. DE01");

function checkSubjectCode(value: string, ctx: z.RefinementCtx, siteCode?: string): void {
  if (looksLikeDate(value)) {
    ctx.addIssue({ code: "custom", message: "This looks like a date. Cairn holds no birth or other personal dates: use a code such as DE01-007." });
    return;
  }
  if (looksLikePersonalName(value)) {
    ctx.addIssue({ code: "custom", message: "This looks like a personal name. Cairn holds pseudonymous codes only, such as DE01-007." });
    return;
  }
  const m = SUBJECT_CODE.exec(value);
  if (!m) {
    ctx.addIssue({ code: "custom", message: "Subject code: site code, a dash and 3 to 5 digits, e.g. DE01-007" });
    return;
  }
  const [, site, digits] = m as unknown as [string, string, string];
  if (!/\d/.test(site)) {
    ctx.addIssue({ code: "custom", message: "The part before the dash must be a site code such as DE01" });
    return;
  }
  if (siteCode !== undefined && site !== siteCode) {
    ctx.addIssue({ code: "custom", message: `Subject codes at site ${siteCode} start with ${siteCode}- (got ${site}-)` });
    return;
  }
  // A 4-digit number from 1900 to 2099 reads as a birth year; 3- or 5-digit numbering avoids it.
  if (digits.length === 4 && /^(19|20)\d{2}$/.test(digits)) {
    ctx.addIssue({ code: "custom", message: `The number ${digits} looks like a year; number subjects with 3 or 5 digits (e.g. ${site}-007)` });
  }
}

// A code typed in lower case ("de01-007") is still a code: capitalise it before checking.
function normaliseCase(value: string): string {
  const v = value.trim();
  return /^[a-z]{2}[a-z0-9]*\d[a-z0-9]*-\d+$/i.test(v) ? v.toUpperCase() : v;
}

/** Any valid pseudonymous subject code (trimmed, capitalised). */
export const subjectCodeSchema = z
  .string()
  .transform(normaliseCase)
  .superRefine((v, ctx) => checkSubjectCode(v, ctx));

/** A subject code that must belong to the given site. */
export function subjectCodeSchemaForSite(siteCode: string) {
  return z
    .string()
    .transform(normaliseCase)
    .superRefine((v, ctx) => checkSubjectCode(v, ctx, siteCode));
}

/**
 * The code of the n-th subject at a site: 3 digits up to 999 ("DE01", 7) → "DE01-007", then 5
 * digits, so a number never reads as a year.
 */
export function formatSubjectCode(siteCode: string, n: number): string {
  if (!Number.isInteger(n) || n < 1 || n > 99999) throw new RangeError(`Subject number must be 1–99999, got ${n}`);
  const code = `${siteCode}-${String(n).padStart(n < 1000 ? 3 : 5, "0")}`;
  const r = subjectCodeSchemaForSite(siteCode).safeParse(code);
  if (!r.success) throw new RangeError(r.error.issues[0]?.message ?? `Invalid subject code ${code}`);
  return code;
}
