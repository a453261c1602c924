// Plain text of protocol nodes, as used by the redline, the summary of changes and the PDF.
import type { ProtocolNode } from "./types";

/** Text of a node: blocks inside lists and cells are separated by newlines, table cells by tabs. */
export function nodePlainText(node: ProtocolNode): string {
  if (node.type === "text") return node.text ?? "";
  if (node.type === "hardBreak") return "\n";
  const children = node.content ?? [];
  if (node.type === "paragraph" || node.type === "heading") return children.map(nodePlainText).join("");
  if (node.type === "tableRow") return children.map(nodePlainText).join("\t");
  return children.map(nodePlainText).join("\n");
}

/** Top-level blocks of a document (the unit of sections and of the redline). */
export function topLevelBlocks(doc: ProtocolNode): ProtocolNode[] {
  return doc.content ?? [];
}
