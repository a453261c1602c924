// Link targets a protocol may carry: absolute http, https and mailto URLs only.
// Client-safe (no node imports): the editor and the server renderer share it.

export const allowedLinkProtocols = ["http:", "https:", "mailto:"] as const;

/**
 * The normalised href if it is an absolute http/https/mailto URL, otherwise null.
 * Browsers ignore ASCII tab/newline anywhere in a URL and trim C0 controls and spaces at
 * its ends, so "java\tscript:" means "javascript:": we strip the same characters before
 * looking at the scheme (anything else before it fails the scheme test), and reject
 * anything the URL parser does not accept. The parser's normalised form is returned.
 */
export function safeHref(raw: unknown): string | null {
  if (typeof raw !== "string") return null;
  // As a browser does: tab, CR and LF vanish anywhere; C0 controls and spaces are trimmed at the ends.
  // eslint-disable-next-line no-control-regex
  const cleaned = raw.replace(/[\t\n\r]/g, "").replace(/^[\u0000-\u0020\u00a0\ufeff]+|[\u0000-\u0020\u00a0\ufeff]+$/g, "");
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
