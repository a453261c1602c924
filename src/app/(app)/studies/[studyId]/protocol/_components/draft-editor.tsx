"use client";

import { EditorContent, useEditor, type JSONContent } from "@tiptap/react";
import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { apiFetch, ApiError } from "@/lib/api/client";
import { protocolExtensions } from "@/lib/protocol/extensions";
import { computeRedline, diffVisitSchedules } from "@/lib/protocol/redline";
import { sectionNumberingClass } from "@/lib/protocol/sections";
import { prefillSummaryOfChanges, type SummaryRow } from "@/lib/protocol/summary-of-changes";
import type { ScheduledVisit } from "@/lib/protocol/visit-schedule";
import { studyPath } from "@/lib/nav";
import { EditorToolbar } from "./editor-toolbar";
import { RedlineView } from "./redline-view";
import { SummaryEditor } from "./summary-editor";
import { parseRows, toRows, VisitScheduleEditor, type VisitRow } from "./visit-schedule-editor";
import { ProblemList } from "@/components/problem-list";

type Version = {
  id: string;
  versionLabel: string;
  revision: number;
  content: JSONContent;
  visitSchedule: ScheduledVisit[];
  summaryOfChanges: SummaryRow[];
  substantial: boolean | null;
  substantialReason: string | null;
  amendmentNumber: number | null;
  reviewComments: { at: string; byName: string; text: string }[];
  updatedAt: string;
};
type Parent = { id: string; versionLabel: string; content: unknown; visitSchedule: ScheduledVisit[] };
type SaveState = "saved" | "unsaved" | "saving" | "conflict" | "error";

const AUTOSAVE_MS = 1500;

/**
 * The draft editor: TipTap text with numbered sections, the schedule of visits and the summary of
 * changes, autosaved together. Each save names the revision it was based on; a 409 stops autosave
 * and shows the other person's saved text against ours, and the writer chooses what to keep.
 */
export function DraftEditor({ studyId, initial, parent }: { studyId: string; initial: Version; parent: Parent | null }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const extensions = useMemo(() => protocolExtensions(), []);
  const [label, setLabel] = useState(initial.versionLabel);
  const [revision, setRevision] = useState(initial.revision);
  const [rows, setRowsState] = useState<VisitRow[]>(() => toRows(initial.visitSchedule));
  const [summary, setSummaryState] = useState<SummaryRow[]>(initial.summaryOfChanges);
  const [substantial, setSubstantialState] = useState<boolean | null>(initial.substantial);
  const [reason, setReasonState] = useState(initial.substantialReason ?? "");
  const [state, setState] = useState<SaveState>("saved");
  const [savedAt, setSavedAt] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [conflict, setConflict] = useState<Version | null>(null);
  const [submitProblems, setSubmitProblems] = useState<{ message: string; fields?: Record<string, string[]> } | null>(null);
  const [submitting, setSubmitting] = useState(false);

  // Refs carry the latest values into the async save.
  const live = useRef({ doc: initial.content as unknown, rows, summary, substantial, reason, revision: initial.revision });
  const seq = useRef(0);
  const saving = useRef<Promise<void> | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const inConflict = useRef(false);

  const scheduleErrors = useMemo(() => {
    const p = parseRows(rows);
    return p.ok ? {} : p.errors;
  }, [rows]);
  const summaryIncomplete = summary.some((r) => !r.section.trim());

  const save = useCallback(async (): Promise<void> => {
    if (saving.current) {
      await saving.current;
      if (seq.current === 0) return;
    }
    if (inConflict.current) return;
    const run = async () => {
      const startedAt = seq.current;
      const l = live.current;
      const parsed = parseRows(l.rows);
      const summaryOk = l.summary.every((r) => r.section.trim());
      const body = {
        baseRevision: l.revision,
        content: l.doc,
        ...(parsed.ok ? { visitSchedule: parsed.visits } : {}),
        ...(summaryOk ? { summaryOfChanges: l.summary } : {}),
        ...(parent && l.substantial !== null ? { substantial: l.substantial } : {}),
        substantialReason: l.reason,
      };
      setState("saving");
      try {
        const res = await fetch(`/api/v1/protocol-versions/${initial.id}`, { method: "PUT", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
        const json = await res.json().catch(() => null);
        if (res.status === 409 && json?.current) {
          inConflict.current = true;
          setConflict(json.current as Version);
          setError(json.error?.message ?? "Someone else saved this draft.");
          setState("conflict");
          return;
        }
        if (!res.ok) {
          setError(json?.error?.message ?? `Saving failed (${res.status}).`);
          setState("error");
          return;
        }
        live.current.revision = json.version.revision;
        setRevision(json.version.revision);
        setLabel(json.version.versionLabel);
        setSavedAt(new Date().toLocaleTimeString());
        setError(null);
        if (seq.current === startedAt) {
          seq.current = 0;
          setState("saved");
        } else setState("unsaved");
        void queryClient.invalidateQueries({ queryKey: ["protocol-compare", studyId] });
      } catch {
        setError("Cairn could not be reached; your changes are kept here and will be saved when you try again.");
        setState("error");
      }
    };
    saving.current = run().finally(() => {
      saving.current = null;
    });
    await saving.current;
    // Edits made while saving: save them too.
    if (seq.current !== 0 && !inConflict.current) schedule();
  }, [initial.id, parent, queryClient, studyId]);

  const schedule = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => void save(), AUTOSAVE_MS);
  }, [save]);

  const changed = useCallback(() => {
    seq.current += 1;
    if (!inConflict.current) {
      setState("unsaved");
      schedule();
    }
  }, [schedule]);

  const editor = useEditor({
    extensions,
    content: initial.content,
    immediatelyRender: false,
    editorProps: { attributes: { class: `${sectionNumberingClass} cairn-protocol min-h-96 p-4`, "aria-label": "Protocol text", "data-testid": "protocol-editor" } },
    onUpdate: ({ editor: e }) => {
      live.current.doc = e.getJSON();
      changed();
    },
  });

  const setRows = (r: VisitRow[]) => {
    live.current.rows = r;
    setRowsState(r);
    changed();
  };
  const setSummary = (r: SummaryRow[]) => {
    live.current.summary = r;
    setSummaryState(r);
    changed();
  };
  const setSubstantial = (v: boolean) => {
    live.current.substantial = v;
    setSubstantialState(v);
    changed();
  };
  const setReason = (v: string) => {
    live.current.reason = v;
    setReasonState(v);
    changed();
  };

  // Warn before leaving with unsaved work.
  useEffect(() => {
    const onLeave = (e: BeforeUnloadEvent) => {
      if (seq.current !== 0 || inConflict.current) e.preventDefault();
    };
    window.addEventListener("beforeunload", onLeave);
    return () => window.removeEventListener("beforeunload", onLeave);
  }, []);
  useEffect(() => () => void (timer.current && clearTimeout(timer.current)), []);

  function prefill() {
    if (!parent) return;
    const parsed = parseRows(live.current.rows);
    const computed = prefillSummaryOfChanges(
      computeRedline(parent.content, live.current.doc),
      diffVisitSchedules(parent.visitSchedule, parsed.ok ? parsed.visits : initial.visitSchedule),
    );
    // Keep what the writer already wrote for a section.
    const bySection = new Map(live.current.summary.map((r) => [r.section, r]));
    const merged = computed.map((r) => {
      const old = bySection.get(r.section);
      return old ? { ...r, rationale: old.rationale } : r;
    });
    const manual = live.current.summary.filter((r) => !computed.some((c) => c.section === r.section) && r.rationale.trim());
    setSummary([...merged, ...manual]);
  }

  function takeTheirs() {
    if (!conflict) return;
    editor?.commands.setContent(conflict.content, { emitUpdate: false });
    const r = toRows(conflict.visitSchedule);
    live.current = { doc: conflict.content, rows: r, summary: conflict.summaryOfChanges, substantial: conflict.substantial, reason: conflict.substantialReason ?? "", revision: conflict.revision };
    setRowsState(r);
    setSummaryState(conflict.summaryOfChanges);
    setSubstantialState(conflict.substantial);
    setReasonState(conflict.substantialReason ?? "");
    setRevision(conflict.revision);
    setLabel(conflict.versionLabel);
    seq.current = 0;
    inConflict.current = false;
    setConflict(null);
    setError(null);
    setState("saved");
  }

  async function keepMine() {
    if (!conflict) return;
    // A deliberate overwrite after seeing the other change: based on their revision now.
    live.current.revision = conflict.revision;
    inConflict.current = false;
    setConflict(null);
    seq.current += 1;
    await save();
  }

  async function submit() {
    setSubmitProblems(null);
    setSubmitting(true);
    try {
      if (timer.current) clearTimeout(timer.current);
      if (seq.current !== 0 || state !== "saved") await save();
      if (seq.current !== 0 || inConflict.current) {
        setSubmitProblems({ message: "Save your changes first (see the message above)." });
        return;
      }
      await apiFetch(`/api/v1/protocol-versions/${initial.id}/submit`, { method: "POST", json: {} });
      router.push(`${studyPath(studyId, "protocol")}/${initial.id}`);
      router.refresh();
    } catch (e) {
      setSubmitProblems(e instanceof ApiError ? { message: e.message, fields: e.fields } : { message: "Submitting failed; try again." });
    } finally {
      setSubmitting(false);
    }
  }

  const missing = new Set(
    Object.keys(submitProblems?.fields ?? {})
      .map((k) => /^summaryOfChanges\.(\d+)\.rationale$/.exec(k)?.[1])
      .filter((x): x is string => x !== undefined)
      .map(Number)
      .filter((i) => !summary[i]?.rationale.trim()),
  );

  const stateText: Record<SaveState, string> = {
    saved: savedAt ? `All changes saved · revision ${revision} · ${savedAt}` : `Saved · revision ${revision}`,
    unsaved: "Unsaved changes",
    saving: "Saving…",
    conflict: "Not saved: someone else saved first",
    error: "Not saved",
  };

  return (
    <div className="space-y-4">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <h1>
          Draft version <span data-testid="draft-label">{label}</span>
          {initial.amendmentNumber ? ` · amendment ${initial.amendmentNumber}` : ""}
        </h1>
        <div className="flex items-center gap-3">
          <span
            role="status"
            aria-live="polite"
            data-testid="save-state"
            data-state={state}
            className={`rounded border px-2 py-1 text-sm ${state === "saved" ? "border-lichen text-lichen-dark" : state === "conflict" || state === "error" ? "border-brick text-brick" : "border-ochre text-ochre-dark"}`}
          >
            {state === "saved" ? "✓ " : state === "saving" ? "… " : "● "}
            {stateText[state]}
          </span>
          <button type="button" className="btn-secondary" onClick={() => void save()} disabled={state === "saving" || state === "conflict"}>
            Save now
          </button>
        </div>
      </header>

      {initial.reviewComments.length > 0 && (
        <section className="card border-ochre" aria-labelledby="returned-comments">
          <h2 id="returned-comments">Reviewer&apos;s comments to address</h2>
          <ul className="mt-1 space-y-1 text-sm">
            {initial.reviewComments.map((c, i) => (
              <li key={i} className="border-l-4 border-ochre pl-3">
                <span className="whitespace-pre-wrap">{c.text}</span> <span className="text-xs text-muted">— {c.byName}</span>
              </li>
            ))}
          </ul>
        </section>
      )}

      {error && state !== "conflict" && (
        <p role="alert" className="text-sm text-brick">
          {error}{" "}
          <button type="button" className="underline" onClick={() => void save()}>
            Try again
          </button>
        </p>
      )}

      {conflict && (
        <section className="card space-y-3 border-brick" role="alert" aria-labelledby="conflict-title" data-testid="conflict">
          <h2 id="conflict-title">Someone else saved this draft while you were editing</h2>
          <p className="text-sm">{error}</p>
          <p className="text-sm">
            Below: their saved revision {conflict.revision} compared with your unsaved text (their text struck through where yours differs, yours underlined). Nothing is
            lost until you choose.
          </p>
          <RedlineView
            redline={computeRedline(conflict.content, live.current.doc)}
            visits={(() => {
              const p = parseRows(live.current.rows);
              return p.ok ? diffVisitSchedules(conflict.visitSchedule, p.visits) : undefined;
            })()}
            fromLabel={`${conflict.versionLabel} (saved, revision ${conflict.revision})`}
            toLabel={`${label} (yours, unsaved)`}
          />
          <div className="flex flex-wrap gap-2">
            <button type="button" className="btn-secondary" onClick={takeTheirs}>
              Use their version (discard mine)
            </button>
            <button type="button" className="btn-danger" onClick={() => void keepMine()}>
              Keep mine (replace theirs)
            </button>
          </div>
        </section>
      )}

      <section className="card p-0" aria-labelledby="text-title">
        <h2 id="text-title" className="px-4 pt-3">
          Text
        </h2>
        {editor ? <EditorToolbar editor={editor} /> : null}
        {editor ? <EditorContent editor={editor} /> : <p className="animate-pulse p-4 text-sm text-muted">Loading the editor…</p>}
      </section>

      <section className="card space-y-2" aria-labelledby="schedule-title">
        <h2 id="schedule-title">Schedule of visits</h2>
        <VisitScheduleEditor rows={rows} onChange={setRows} errors={scheduleErrors} />
        {Object.keys(scheduleErrors).length > 0 && <p className="text-sm text-brick">The schedule is not saved until the marked fields are fixed.</p>}
        <p className="governs">Visit days and windows are those of this protocol version once approved; the ethics committee&apos;s approval governs at each site.</p>
      </section>

      {parent && (
        <section className="card space-y-3" aria-labelledby="amendment-title">
          <h2 id="amendment-title">Amendment of version {parent.versionLabel}</h2>
          <fieldset className="flex flex-wrap gap-4 text-sm">
            <legend className="mb-1 font-semibold">Kind of amendment</legend>
            <label className="flex items-center gap-1">
              <input type="radio" name="substantial" checked={substantial === true} onChange={() => setSubstantial(true)} /> Substantial (next major version)
            </label>
            <label className="flex items-center gap-1">
              <input type="radio" name="substantial" checked={substantial === false} onChange={() => setSubstantial(false)} /> Non-substantial (next minor version)
            </label>
          </fieldset>
          <label className="field">
            <span>Why it is {substantial ? "substantial" : "non-substantial"}</span>
            <textarea className="input min-h-16" value={reason} onChange={(e) => setReason(e.target.value)} aria-label="Reason for the kind of amendment" />
          </label>
          <h3 className="font-semibold">Summary of changes</h3>
          <SummaryEditor rows={summary} onChange={setSummary} onPrefill={prefill} missing={missing} />
          {summaryIncomplete && <p className="text-sm text-brick">Every row needs a section name before the summary is saved.</p>}
        </section>
      )}

      <section className="card space-y-2">
        <button type="button" className="btn" onClick={() => void submit()} disabled={submitting || state === "conflict"}>
          {submitting ? "Submitting…" : "Submit for review"}
        </button>
        {submitProblems && <ProblemList problem={submitProblems} testId="submit-problems" />}
      </section>
    </div>
  );
}
