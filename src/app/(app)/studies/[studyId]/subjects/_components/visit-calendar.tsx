"use client";

import { useState } from "react";
import type { CalendarEntry } from "@/lib/visits/subject-calendar";
import { VisitStateChip } from "./subject-status-chip";
import { ErrorNote, useApiAction } from "./use-api-action";

function days(n: number | null) {
  if (n === null || n === 0) return "";
  return n < 0 ? `${-n} d early` : `${n} d late`;
}

/** The subject's visits with their windows and state; coordinators record, monitors verify. */
export function VisitCalendar({ subjectId, entries, canRecord, canVerify }: { subjectId: string; entries: CalendarEntry[]; canRecord: boolean; canVerify: boolean }) {
  const [editing, setEditing] = useState<string | null>(null);
  return (
    <div className="overflow-x-auto">
      <table className="table-dense" data-testid="visit-calendar">
        <thead>
          <tr>
            <th>Visit</th>
            <th>Version</th>
            <th>Target</th>
            <th>Window</th>
            <th>State</th>
            <th>Done on</th>
            <th>Data entered</th>
            <th>Verified</th>
            {(canRecord || canVerify) && <th />}
          </tr>
        </thead>
        <tbody>
          {entries.map((e) => (
            <Row key={e.visitCode} subjectId={subjectId} e={e} canRecord={canRecord} canVerify={canVerify} open={editing === e.visitCode} setOpen={(o) => setEditing(o ? e.visitCode : null)} />
          ))}
          {entries.length === 0 && (
            <tr>
              <td colSpan={8 + (canRecord || canVerify ? 1 : 0)}>No visits: a subject who failed screening, or one with no protocol version in force at the site yet, has none.</td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}

function Row({ subjectId, e, canRecord, canVerify, open, setOpen }: { subjectId: string; e: CalendarEntry; canRecord: boolean; canVerify: boolean; open: boolean; setOpen: (o: boolean) => void }) {
  const { run, error, pending } = useApiAction();
  const cols = 8 + (canRecord || canVerify ? 1 : 0);
  return (
    <>
      <tr data-visit={e.visitCode}>
        <td className="min-w-40">
          <span className="font-mono">{e.visitCode}</span> {e.label}
        </td>
        <td>{e.versionLabel}</td>
        <td className="whitespace-nowrap font-mono">{e.targetDate ?? "—"}</td>
        <td className="whitespace-nowrap font-mono">{e.windowStart ? `${e.windowStart} – ${e.windowEnd}` : `${e.anchor} date not recorded`}</td>
        <td>
          <span className="inline-flex items-center gap-1 whitespace-nowrap">
            <VisitStateChip state={e.state} /> <span className="text-xs">{days(e.daysOutsideWindow)}</span>
          </span>
        </td>
        <td className="whitespace-nowrap font-mono">{e.actualDate ?? ""}</td>
        <td className="whitespace-nowrap font-mono">{e.dataEnteredOn ?? ""}</td>
        <td className="whitespace-nowrap font-mono">{e.verifiedOn ?? ""}</td>
        {(canRecord || canVerify) && (
          <td>
            {canRecord && e.state !== "not_scheduled" && (
              <button type="button" className="btn-secondary whitespace-nowrap" onClick={() => setOpen(!open)} aria-expanded={open}>
                {e.recorded ? "Correct" : "Record"} {e.visitCode}
              </button>
            )}
            {canVerify && e.state.startsWith("completed") && !e.verifiedOn && (
              <form
                className="flex items-center gap-1"
                onSubmit={async (ev) => {
                  ev.preventDefault();
                  const on = String(new FormData(ev.currentTarget).get("verifiedOn") ?? "");
                  await run(`/api/v1/subjects/${subjectId}/visits/${e.visitCode}/verification`, { method: "POST", json: { verifiedOn: on } });
                }}
              >
                <label className="sr-only" htmlFor={`verify-${e.visitCode}`}>
                  Verified on
                </label>
                <input id={`verify-${e.visitCode}`} className="input" type="date" name="verifiedOn" required />
                <button className="btn-secondary" disabled={pending}>
                  Verify
                </button>
              </form>
            )}
          </td>
        )}
      </tr>
      {(open || error) && (
        <tr>
          <td colSpan={cols}>
            {open && (
              <form
                className="flex flex-wrap items-end gap-3 py-2"
                aria-label={`Record visit ${e.visitCode}`}
                onSubmit={async (ev) => {
                  ev.preventDefault();
                  const f = new FormData(ev.currentTarget);
                  const outcome = String(f.get("outcome"));
                  const actual = String(f.get("actualDate") ?? "");
                  const entered = String(f.get("dataEnteredOn") ?? "");
                  const res = await run(`/api/v1/subjects/${subjectId}/visits`, {
                    method: "POST",
                    json: { visitCode: e.visitCode, outcome, actualDate: actual || null, dataEnteredOn: entered || null },
                  });
                  if (res) setOpen(false);
                }}
              >
                <label className="field">
                  <span>Outcome</span>
                  <select className="input" name="outcome" defaultValue={e.state === "missed" ? "missed" : "done"}>
                    <option value="done">Done</option>
                    <option value="missed">Missed</option>
                  </select>
                </label>
                <label className="field">
                  <span>Visit date</span>
                  <input className="input" type="date" name="actualDate" defaultValue={e.actualDate ?? ""} />
                </label>
                <label className="field">
                  <span>Data entered on</span>
                  <input className="input" type="date" name="dataEnteredOn" defaultValue={e.dataEnteredOn ?? ""} />
                </label>
                <button className="btn" disabled={pending}>
                  Save {e.visitCode}
                </button>
              </form>
            )}
            <ErrorNote error={error} />
          </td>
        </tr>
      )}
    </>
  );
}
