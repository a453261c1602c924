import { describe, expect, it } from "vitest";
import { getSchema } from "@tiptap/core";
import { Node } from "@tiptap/pm/model";
import { protocolExtensions, protocolMarkTypes, protocolNodeTypes } from "@/lib/protocol/extensions";
import { sanitizeProtocolDoc } from "@/lib/protocol/sanitize";
import { v1Doc } from "./fixtures";

describe("protocolExtensions", () => {
  const schema = getSchema(protocolExtensions());

  it("has exactly the node and mark types the renderer whitelists", () => {
    expect(Object.keys(schema.nodes).sort()).toEqual([...protocolNodeTypes].sort());
    expect(Object.keys(schema.marks).sort()).toEqual([...protocolMarkTypes].sort());
  });

  it("limits headings to levels 1–3", () => {
    const heading = protocolExtensions()
      .flatMap((e) => (e.name === "starterKit" ? (e.config.addExtensions?.call(e as never) ?? []) : [e]))
      .find((e) => e.name === "heading");
    expect(heading?.options.levels).toEqual([1, 2, 3]);
  });

  it("accepts what the whitelist filter lets through as a valid document", () => {
    const hostile = {
      type: "doc",
      content: [
        { type: "heading", attrs: { level: 6 }, content: [{ type: "text", text: "Title" }] },
        { type: "bulletList", content: [{ type: "listItem", content: [] }, { type: "image" }, { type: "listItem", content: [{ type: "heading", attrs: { level: 2 } }] }] },
        { type: "table", content: [{ type: "tableRow", content: [{ type: "tableCell", attrs: { colspan: 2, colwidth: [1] } }] }] },
        { type: "paragraph", content: [{ type: "text", text: "x", marks: [{ type: "link", attrs: { href: "javascript:alert(1)" } }, { type: "bold" }] }] },
      ],
    };
    for (const stored of [v1Doc, hostile]) {
      const node = Node.fromJSON(schema, sanitizeProtocolDoc(stored));
      expect(() => node.check()).not.toThrow();
    }
  });
});
