// Link targets a protocol may carry: absolute http, https and mailto URLs only.
// Client-safe (no node imports): the editor and the server renderer share it.

export const allowedLinkProtocols = ["http:", "https:", "mailto:"] as const;

/**
 * The normalised href if it is an absolute http/https/mailto URL, otherwise null.
 * Browsers ignore ASCII tab/newline anywhere in a URL and trim C0 controls and spaces at
 * its ends, so "java\tscript:" means "javascript:": we strip the same characters before
 * looking at the scheme, and reject anything the URL parser does not accept.
 */
export function safeHref(raw: unknown): string | null {
  if (typeof raw !== "string") return null;
  // URLs legitimately carry no raw whitespace or control characters: drop them all.
  // eslint-disable-next-line no-control-regex
  const cleaned = raw.replace(/[\u0000-\u0020\u007f-\u00a0\u1680\u2000-\u200f\u2028\u2029\u202f\u205f\u3000\ufeff]/g, "");
  if (!/^(https?|mailto):/i.test(cleaned)) return null;
  let url: URL;
  try {
    url = new URL(cleaned);
  } catch {
    return null;
  }
  if (!(allowedLinkProtocols as readonly string[]).includes(url.protocol)) return null;
  if (url.protocol !== "mailto:" && !url.hostname) return null;
  return url.href;
}

export function isSafeHref(raw: unknown): boolean {
  return safeHref(raw) !== null;
}
