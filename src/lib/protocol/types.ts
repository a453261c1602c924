// ProseMirror / TipTap JSON as stored for a protocol version.

export interface ProtocolMark {
  type: string;
  attrs?: Record<string, unknown>;
}

export interface ProtocolNode {
  type: string;
  attrs?: Record<string, unknown>;
  content?: ProtocolNode[];
  marks?: ProtocolMark[];
  text?: string;
}

/** A stored protocol document: the root node, type "doc". */
export type ProtocolDoc = ProtocolNode & { type: "doc" };
