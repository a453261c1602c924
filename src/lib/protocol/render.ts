// Read-only HTML of a stored protocol, rendered without a DOM by @tiptap/static-renderer
// from the shared extension list. The input is first passed through the whitelist filter,
// so the output is inert whatever is stored. Top-level headings get their section number
// as an id and data attribute (the visible number comes from sectionNumberingCss).
import { renderToHTMLString } from "@tiptap/static-renderer/pm/html-string";
import { protocolExtensions } from "./extensions";
import { sanitizeProtocolDoc } from "./sanitize";
import { blockSectionNumbers, sectionNumberingClass } from "./sections";

let cachedExtensions: ReturnType<typeof protocolExtensions> | null = null;

function escapeAttr(value: string): string {
  return value.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** Inner HTML of the document's blocks (wrap it in an element with sectionNumberingClass). */
export function renderProtocolHtml(stored: unknown): string {
  const doc = sanitizeProtocolDoc(stored);
  const numbers = blockSectionNumbers(doc);
  cachedExtensions ??= protocolExtensions();
  return renderToHTMLString({
    content: doc,
    extensions: cachedExtensions,
    options: {
      nodeMapping: {
        heading: ({ node, parent, children }) => {
          const level = Math.min(Math.max(Number(node.attrs?.level) || 1, 1), 3);
          const inner = ([] as string[]).concat(children ?? "").join("");
          // Nodes arrive as ProseMirror nodes: find the section number by position among the doc's children.
          let number: string | undefined;
          if (parent?.type?.name === "doc") {
            let index = -1;
            parent.forEach((child: unknown, _offset: number, i: number) => {
              if (child === node) index = i;
            });
            number = index >= 0 ? numbers[index] ?? undefined : undefined;
          }
          const attrs = number ? ` id="section-${escapeAttr(number.replace(/\./g, "-"))}" data-section="${escapeAttr(number)}"` : "";
          return `<h${level}${attrs}>${inner}</h${level}>`;
        },
      },
      // Belt and braces: the filter already removed unknown types.
      unhandledNode: () => "",
      unhandledMark: ({ children }) => ([] as string[]).concat(children ?? "").join(""),
    },
  });
}

/** The whole read-only view: a wrapper carrying the section-numbering class. */
export function renderProtocolArticle(stored: unknown): string {
  return `<div class="${sectionNumberingClass} cairn-protocol">${renderProtocolHtml(stored)}</div>`;
}
