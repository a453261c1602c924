// The one extension list for protocol documents: the client editor and the server renderer
// both use it, so what is stored, edited and rendered has the same schema. Client-safe.
import type { AnyExtension } from "@tiptap/react";
import StarterKit from "@tiptap/starter-kit";
import { TableKit } from "@tiptap/extension-table";
import { isSafeHref } from "./safe-url";

export const protocolHeadingLevels = [1, 2, 3] as const;

export function protocolExtensions(): AnyExtension[] {
  return [
    StarterKit.configure({
      heading: { levels: [...protocolHeadingLevels] },
      link: {
        openOnClick: false,
        autolink: true,
        defaultProtocol: "https",
        protocols: [],
        // Only absolute http/https/mailto, in the editor and in stored content alike.
        isAllowedUri: (url) => isSafeHref(url),
        shouldAutoLink: (url) => isSafeHref(url),
        HTMLAttributes: { rel: "noopener noreferrer nofollow", target: null, class: null },
      },
      // Underline and strike are kept for the redline (insertion / deletion), never for content.
      underline: false,
      strike: false,
      code: false,
      codeBlock: false,
      blockquote: false,
      horizontalRule: false,
    }),
    TableKit.configure({ table: { resizable: false } }),
  ];
}

/** Node and mark types a stored protocol may contain (everything else is dropped on render). */
export const protocolNodeTypes = [
  "doc",
  "paragraph",
  "heading",
  "text",
  "hardBreak",
  "bulletList",
  "orderedList",
  "listItem",
  "table",
  "tableRow",
  "tableHeader",
  "tableCell",
] as const;
export const protocolMarkTypes = ["bold", "italic", "link"] as const;
