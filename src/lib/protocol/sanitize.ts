// Whitelist filter for stored protocol JSON: what survives is inert whatever was stored.
// Unknown node types are dropped with their content, unknown marks dropped, attributes
// limited to a fixed list of typed values, link hrefs limited to http/https/mailto.
// Client-safe: the API may also run it before saving.
import type { ProtocolDoc, ProtocolMark, ProtocolNode } from "./types";
import { safeHref } from "./safe-url";

const MAX_DEPTH = 40;

function intIn(value: unknown, min: number, max: number): number | null {
  return typeof value === "number" && Number.isInteger(value) && value >= min && value <= max ? value : null;
}

function cellAttrs(attrs: Record<string, unknown> | undefined): Record<string, unknown> {
  const colspan = intIn(attrs?.colspan, 1, 100) ?? 1;
  const rowspan = intIn(attrs?.rowspan, 1, 1000) ?? 1;
  const raw = attrs?.colwidth;
  const colwidth =
    Array.isArray(raw) && raw.length === colspan && raw.every((w) => intIn(w, 1, 10_000) !== null) ? (raw as number[]).slice() : null;
  return { colspan, rowspan, colwidth };
}

function sanitizeMarks(marks: unknown): ProtocolMark[] | undefined {
  if (!Array.isArray(marks)) return undefined;
  const out: ProtocolMark[] = [];
  const seen = new Set<string>();
  for (const m of marks as unknown[]) {
    if (!m || typeof m !== "object") continue;
    const { type, attrs } = m as ProtocolMark;
    if (seen.has(type)) continue;
    if (type === "bold" || type === "italic") {
      out.push({ type });
      seen.add(type);
    } else if (type === "link") {
      const href = safeHref(attrs?.href);
      if (href === null) continue; // unsafe link: keep the text, lose the link
      out.push({ type: "link", attrs: { href } });
      seen.add(type);
    }
  }
  return out.length ? out : undefined;
}

type Kind = "block" | "inline" | "listItem" | "row" | "cell";

function sanitizeChildren(content: unknown, allowed: Kind, depth: number): ProtocolNode[] {
  if (!Array.isArray(content) || depth > MAX_DEPTH) return [];
  const out: ProtocolNode[] = [];
  for (const child of content as unknown[]) {
    const clean = sanitizeNode(child, allowed, depth + 1);
    if (clean) out.push(clean);
  }
  return out;
}

function withContent(node: ProtocolNode, content: ProtocolNode[]): ProtocolNode {
  return content.length ? { ...node, content } : node;
}

function sanitizeNode(raw: unknown, allowed: Kind, depth: number): ProtocolNode | null {
  if (!raw || typeof raw !== "object") return null;
  const node = raw as ProtocolNode;
  const type = node.type;
  if (allowed === "inline") {
    if (type === "text") {
      if (typeof node.text !== "string" || node.text.length === 0) return null;
      const marks = sanitizeMarks(node.marks);
      return marks ? { type: "text", text: node.text, marks } : { type: "text", text: node.text };
    }
    if (type === "hardBreak") return { type: "hardBreak" };
    return null;
  }
  if (allowed === "listItem") {
    if (type !== "listItem") return null;
    const content = sanitizeChildren(node.content, "block", depth);
    // The editor's list item starts with a paragraph ("paragraph block*").
    return { type, content: content[0]?.type === "paragraph" ? content : [{ type: "paragraph" }, ...content] };
  }
  if (allowed === "row") {
    if (type !== "tableRow") return null;
    const content = sanitizeChildren(node.content, "cell", depth);
    return content.length ? { type, content } : null;
  }
  if (allowed === "cell") {
    if (type !== "tableCell" && type !== "tableHeader") return null;
    const content = sanitizeChildren(node.content, "block", depth);
    return { type, attrs: cellAttrs(node.attrs), content: content.length ? content : [{ type: "paragraph" }] };
  }
  switch (type) {
    case "paragraph":
      return withContent({ type }, sanitizeChildren(node.content, "inline", depth));
    case "heading": {
      const level = intIn(node.attrs?.level, 1, 6);
      return withContent({ type, attrs: { level: level === null ? 1 : Math.min(level, 3) } }, sanitizeChildren(node.content, "inline", depth));
    }
    case "bulletList":
    case "orderedList": {
      const content = sanitizeChildren(node.content, "listItem", depth);
      if (!content.length) return null;
      return type === "orderedList"
        ? { type, attrs: { start: intIn(node.attrs?.start, 0, 1_000_000) ?? 1, type: null }, content }
        : { type, content };
    }
    case "table": {
      const content = sanitizeChildren(node.content, "row", depth);
      return content.length ? { type, content } : null;
    }
    default:
      return null;
  }
}

/** A clean copy of a stored document (never throws; junk becomes an empty document). */
export function sanitizeProtocolDoc(raw: unknown): ProtocolDoc {
  const content =
    raw && typeof raw === "object" && (raw as ProtocolNode).type === "doc" ? sanitizeChildren((raw as ProtocolNode).content, "block", 0) : [];
  return { type: "doc", content: content.length ? content : [{ type: "paragraph" }] };
}
