// Life of a protocol version: Draft → In review → Approved → Released (its parent becomes
// Superseded). A reviewer may send a version in review back: In review → Returned, with comments.
// Choice: a Returned version is read-only (it keeps what the reviewer commented on); the writer
// reopens it (Returned → Draft), edits and submits again (Draft → In review).
// The author of a version may never approve or release it (author and approver differ).
// Client-safe, pure.

export const protocolStatuses = ["draft", "in_review", "returned", "approved", "released", "superseded"] as const;
export type ProtocolStatus = (typeof protocolStatuses)[number];

export const protocolStatusLabels: Record<ProtocolStatus, string> = {
  draft: "Draft",
  in_review: "In review",
  returned: "Returned",
  approved: "Approved",
  released: "Released",
  superseded: "Superseded",
};

export type ProtocolPermission = "protocol.submit" | "protocol.reopen" | "protocol.return" | "protocol.approve" | "protocol.release";

/** Which study roles hold each protocol permission. */
export const protocolPermissionRoles: Record<ProtocolPermission, readonly string[]> = {
  "protocol.submit": ["protocol_writer"],
  "protocol.reopen": ["protocol_writer"],
  "protocol.return": ["medical_reviewer"],
  "protocol.approve": ["medical_reviewer"],
  "protocol.release": ["medical_reviewer"],
};

export interface TransitionRule {
  from: ProtocolStatus;
  to: ProtocolStatus;
  action: "submit" | "reopen" | "return" | "approve" | "release";
  permission: ProtocolPermission;
  /** The version's author may not take this step. */
  authorForbidden: boolean;
  /** A comment is required (a return says why). */
  commentRequired: boolean;
}

export const protocolTransitions: readonly TransitionRule[] = [
  { from: "draft", to: "in_review", action: "submit", permission: "protocol.submit", authorForbidden: false, commentRequired: false },
  { from: "in_review", to: "returned", action: "return", permission: "protocol.return", authorForbidden: false, commentRequired: true },
  { from: "returned", to: "draft", action: "reopen", permission: "protocol.reopen", authorForbidden: false, commentRequired: false },
  { from: "in_review", to: "approved", action: "approve", permission: "protocol.approve", authorForbidden: true, commentRequired: false },
  { from: "approved", to: "released", action: "release", permission: "protocol.release", authorForbidden: true, commentRequired: false },
];

export type TransitionRefusalCode = "unknown_status" | "not_allowed" | "automatic_only" | "missing_permission" | "author_cannot_approve" | "comment_required";

export type TransitionResult =
  | { ok: true; rule: TransitionRule; /** Released: the parent version becomes Superseded. */ parentBecomes: "superseded" | null }
  | { ok: false; code: TransitionRefusalCode; message: string };

export interface TransitionRequest {
  from: string;
  to: string;
  actorUserId: string;
  authorUserId: string;
  actorRoles: readonly string[];
  comment?: string;
}

function isStatus(s: string): s is ProtocolStatus {
  return (protocolStatuses as readonly string[]).includes(s);
}

export function allowedTransitionsFrom(status: ProtocolStatus): TransitionRule[] {
  return protocolTransitions.filter((t) => t.from === status);
}

export function checkTransition({ from, to, actorUserId, authorUserId, actorRoles, comment }: TransitionRequest): TransitionResult {
  if (!isStatus(from)) return { ok: false, code: "unknown_status", message: `"${from}" is not a protocol version status.` };
  if (!isStatus(to)) return { ok: false, code: "unknown_status", message: `"${to}" is not a protocol version status.` };
  const label = protocolStatusLabels;
  if (to === "superseded")
    return {
      ok: false,
      code: "automatic_only",
      message: "A version becomes Superseded only when a newer version of the protocol is released, never by hand.",
    };
  const rule = protocolTransitions.find((t) => t.from === from && t.to === to);
  if (!rule) {
    const options = allowedTransitionsFrom(from).map((t) => label[t.to]);
    return {
      ok: false,
      code: "not_allowed",
      message: `A version cannot go from ${label[from]} to ${label[to]}.${options.length ? ` From ${label[from]} it can go to: ${options.join(", ")}.` : ` ${label[from]} is final.`}`,
    };
  }
  const roles = protocolPermissionRoles[rule.permission];
  if (!actorRoles.some((r) => roles.includes(r)))
    return {
      ok: false,
      code: "missing_permission",
      message: `Only a ${roles.map((r) => r.replace(/_/g, " ")).join(" or ")} can ${rule.action} a protocol version (${label[from]} → ${label[to]}).`,
    };
  if (rule.authorForbidden && actorUserId === authorUserId)
    return {
      ok: false,
      code: "author_cannot_approve",
      message: `You wrote this version, so you cannot ${rule.action} it: another medical reviewer must.`,
    };
  if (rule.commentRequired && !comment?.trim())
    return { ok: false, code: "comment_required", message: "Say what must change: a returned version needs the reviewer's comments." };
  return { ok: true, rule, parentBecomes: rule.to === "released" ? "superseded" : null };
}
