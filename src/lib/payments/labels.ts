import type { Tone } from "@/components/status-chip";

// Words shown for payment states (client-safe: no server or node imports).

export const runStateLabels = { prepared: ["Awaiting approval", "attention"], approved: ["Approved", "info"], sending: ["Sending", "progress"], sent: ["Sent", "ok"], cancelled: ["Cancelled", "neutral"] } as const satisfies Record<string, readonly [string, Tone]>;
export const transferStateLabels = { queued: ["Queued", "neutral"], sending: ["Sending", "progress"], sent: ["Sent", "info"], paid: ["Paid", "ok"], failed: ["Failed", "danger"], reversed: ["Reversed", "danger"] } as const satisfies Record<string, readonly [string, Tone]>;
export const lineStateLabels = { in_run: ["In a run", "neutral"], sent: ["Sent", "info"], paid: ["Paid", "ok"], failed: ["Failed — due again", "danger"], reversed: ["Reversed — due again", "danger"] } as const satisfies Record<string, readonly [string, Tone]>;
export const payeeStateLabels = { pending: ["Pending", "attention"], verified: ["Verified", "ok"], restricted: ["Restricted", "danger"], rejected: ["Rejected", "danger"], none: ["No account", "neutral"] } as const satisfies Record<string, readonly [string, Tone]>;
export const queryStateLabels = { open: ["Open", "attention"], answered: ["Answered", "info"], resolved: ["Resolved", "ok"] } as const satisfies Record<string, readonly [string, Tone]>;

export type LabelTable = Record<string, readonly [string, Tone]>;
