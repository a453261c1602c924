"use client";

import { useState } from "react";
import type { InlineBlock, Redline, VisitScheduleDiff, WordPart } from "@/lib/protocol/redline";
import { visitFieldLabels } from "@/lib/protocol/summary-of-changes";

// Redline display: inline (one column, deletions struck through before insertions underlined) or
// side by side (earlier left, later right). Text is React-escaped: nothing in it is interpreted.

function Parts({ parts, side }: { parts: WordPart[]; side?: "left" | "right" }) {
  return (
    <>
      {parts.map((p, i) =>
        p.kind === "equal" ? (
          <span key={i}>{p.text}</span>
        ) : p.kind === "inserted" && side !== "left" ? (
          <ins key={i} className="redline-ins">
            {p.text}
          </ins>
        ) : p.kind === "deleted" && side !== "right" ? (
          <del key={i} className="redline-del">
            {p.text}
          </del>
        ) : null,
      )}
    </>
  );
}

/** A table block's parts as a grid: cells are separated by tabs and rows by newlines in the plain text. */
function tableGrid(parts: WordPart[], side: "left" | "right"): WordPart[][][] {
  const rows: WordPart[][][] = [[[]]];
  for (const p of parts) {
    if ((side === "left" && p.kind === "inserted") || (side === "right" && p.kind === "deleted")) continue;
    for (const piece of p.text.split(/(\t|\n)/)) {
      if (piece === "\t") rows[rows.length - 1]!.push([]);
      else if (piece === "\n") rows.push([[]]);
      else if (piece) {
        const row = rows[rows.length - 1]!;
        row[row.length - 1]!.push({ kind: p.kind, text: piece });
      }
    }
  }
  return rows;
}

function TableSide({ parts, side }: { parts: WordPart[]; side: "left" | "right" }) {
  const rows = tableGrid(parts, side);
  return (
    <table className="redline-table">
      <tbody>
        {rows.map((cells, i) => (
          <tr key={i}>
            {cells.map((cell, j) => (
              <td key={j}>
                <Parts parts={cell} side={side} />
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const kindWord = { equal: "", changed: "Changed", inserted: "Added", deleted: "Removed" } as const;

function BlockShell({ type, level, section, children }: { type: string; level?: number; section: string | null; children: React.ReactNode }) {
  const heading = type === "heading";
  const cls = heading ? (level === 1 ? "text-lg font-bold mt-3" : level === 2 ? "text-base font-bold mt-2" : "font-bold mt-2") : "whitespace-pre-wrap";
  return (
    <div className={cls}>
      {heading && section ? <span className="mr-2 text-muted">{section}</span> : null}
      {children}
    </div>
  );
}

function InlineView({ blocks, showEqual }: { blocks: InlineBlock[]; showEqual: boolean }) {
  return (
    <div className="space-y-1" data-testid="redline-inline">
      {blocks
        .filter((b) => showEqual || b.kind !== "equal" || b.type === "heading")
        .map((b, i) => (
          <div key={i} className={b.kind === "equal" ? "" : "border-l-4 border-slate pl-2"} data-kind={b.kind}>
            {b.kind !== "equal" && <span className="sr-only">{kindWord[b.kind]}: </span>}
            <BlockShell type={b.type} level={b.level} section={b.section}>
              <Parts parts={b.parts} />
            </BlockShell>
            {b.formatOnly && <p className="text-xs italic text-muted">(formatting changed)</p>}
          </div>
        ))}
    </div>
  );
}

function SideBySide({ redline, showEqual, fromLabel, toLabel }: { redline: Redline; showEqual: boolean; fromLabel: string; toLabel: string }) {
  return (
    <table className="table-dense table-fixed" data-testid="redline-side">
      <thead>
        <tr>
          <th className="w-1/2">Version {fromLabel}</th>
          <th className="w-1/2">Version {toLabel}</th>
        </tr>
      </thead>
      <tbody>
        {redline.rows
          .filter((r) => showEqual || r.kind !== "equal")
          .map((r, i) => (
            <tr key={i} data-kind={r.kind}>
              <td className={r.kind === "deleted" ? "bg-brick-light" : ""}>
                {r.left &&
                  (r.left.type === "table" ? (
                    <TableSide parts={r.left.parts} side="left" />
                  ) : (
                    <BlockShell type={r.left.type} level={r.left.level} section={r.left.section}>
                      <Parts parts={r.left.parts} side="left" />
                    </BlockShell>
                  ))}
              </td>
              <td className={r.kind === "inserted" ? "bg-slate-light" : ""}>
                {r.right &&
                  (r.right.type === "table" ? (
                    <TableSide parts={r.right.parts} side="right" />
                  ) : (
                    <BlockShell type={r.right.type} level={r.right.level} section={r.right.section}>
                      <Parts parts={r.right.parts} side="right" />
                    </BlockShell>
                  ))}
              </td>
            </tr>
          ))}
      </tbody>
    </table>
  );
}

const show = (v: unknown) => (Array.isArray(v) ? (v.length ? v.join("; ") : "none") : String(v));

export function VisitScheduleDiffView({ visits }: { visits: VisitScheduleDiff }) {
  if (!visits.hasChanges) return <p className="text-sm">No change to the schedule of visits.</p>;
  return (
    <table className="table-dense" data-testid="visit-diff">
      <thead>
        <tr>
          <th>Visit</th>
          <th>Change</th>
          <th>Before</th>
          <th>After</th>
        </tr>
      </thead>
      <tbody>
        {visits.removed.map((v) => (
          <tr key={`r-${v.code}`}>
            <td className="font-mono">{v.code}</td>
            <td>Removed</td>
            <td>
              <del className="redline-del">{v.label}, day {v.dayOffset} from {v.anchor}</del>
            </td>
            <td></td>
          </tr>
        ))}
        {visits.added.map((v) => (
          <tr key={`a-${v.code}`}>
            <td className="font-mono">{v.code}</td>
            <td>Added</td>
            <td></td>
            <td>
              <ins className="redline-ins">
                {v.label}, day {v.dayOffset} from {v.anchor} (−{v.windowBefore}/+{v.windowAfter}); {v.procedures.join("; ")}
              </ins>
            </td>
          </tr>
        ))}
        {visits.changed.flatMap((c) =>
          c.fields.map((f) => (
            <tr key={`c-${c.code}-${f.field}`}>
              <td className="font-mono">{c.code}</td>
              <td>{visitFieldLabels[f.field]}</td>
              <td>
                <del className="redline-del">{show(f.before)}</del>
              </td>
              <td>
                <ins className="redline-ins">{show(f.after)}</ins>
              </td>
            </tr>
          )),
        )}
        {visits.orderChanged && (
          <tr>
            <td colSpan={4}>The visits are listed in a different order.</td>
          </tr>
        )}
      </tbody>
    </table>
  );
}

/** Both views with a switch, the counts, and the schedule diff. */
export function RedlineView({ redline, visits, fromLabel, toLabel }: { redline: Redline; visits?: VisitScheduleDiff; fromLabel: string; toLabel: string }) {
  const [mode, setMode] = useState<"inline" | "side">("inline");
  const [showEqual, setShowEqual] = useState(true);
  const s = redline.stats;
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <div role="group" aria-label="Layout" className="flex gap-1">
          <button type="button" className={mode === "inline" ? "btn" : "btn-secondary"} aria-pressed={mode === "inline"} onClick={() => setMode("inline")}>
            Inline
          </button>
          <button type="button" className={mode === "side" ? "btn" : "btn-secondary"} aria-pressed={mode === "side"} onClick={() => setMode("side")}>
            Side by side
          </button>
        </div>
        <label className="flex items-center gap-1">
          <input type="checkbox" checked={!showEqual} onChange={(e) => setShowEqual(!e.target.checked)} /> Changes only
        </label>
        <span data-testid="redline-stats">
          {s.changed} changed, {s.inserted} added, {s.deleted} removed blocks · {s.wordsInserted} words inserted, {s.wordsDeleted} deleted
        </span>
        <span className="text-muted">
          Key: <ins className="redline-ins">inserted</ins> · <del className="redline-del">deleted</del>
        </span>
      </div>
      {!redline.hasChanges && <p className="text-sm">The texts are the same.</p>}
      <div className="cairn-protocol">
        {mode === "inline" ? <InlineView blocks={redline.inline} showEqual={showEqual} /> : <SideBySide redline={redline} showEqual={showEqual} fromLabel={fromLabel} toLabel={toLabel} />}
      </div>
      {visits && (
        <section aria-labelledby="visit-diff-title" className="space-y-2">
          <h2 id="visit-diff-title">Schedule of visits</h2>
          <VisitScheduleDiffView visits={visits} />
        </section>
      )}
    </div>
  );
}
