"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { useState } from "react";
import { DocumentUpload } from "@/components/document-upload";
import { apiFetch } from "@/lib/api/client";
import { blockingStates, itemStateLabels, itemStates, type ItemState } from "@/lib/binder/readiness";
import { proposedExpiry } from "@/lib/binder/dates";
import { siteStatusLabels, type SiteStatus } from "@/lib/sites/site-status";
import { BinderStateChip } from "./binder-state-chip";
import { DownloadLink } from "./download-link";

type Doc = { id: string; fileName: string; createdAt: string; issuedOn: string | null; expiresOn: string | null; reviewState: string; reviewReason?: string | null; uploaderName?: string };
type Item = {
  type: { id: string; code: string; name: string; holder: "site" | "person"; requiredFrom: SiteStatus | null; expires: boolean; validityMonths?: number | null; reference?: string };
  person: { userId: string; name: string } | null;
  required: boolean;
  state: ItemState;
  current: Doc | null;
  earlier: Doc[];
  daysToExpiry: number | null;
};
type Binder = { site: { code: string; name: string; status: SiteStatus }; today: string; counts: Record<ItemState, number>; readyCount: number; requiredCount: number; items: Item[] };

const itemKey = (i: Item) => `${i.type.code}-${i.person?.userId ?? "site"}`;
const when = (iso: string) => iso.slice(0, 16).replace("T", " ");

export function SiteBinderView({
  studyId,
  site,
  sites,
  canUpload,
  canReview,
  maxBytes,
}: {
  studyId: string;
  site: { id: string; code: string; name: string };
  sites: { code: string; name: string }[];
  canUpload: boolean;
  canReview: boolean;
  maxBytes: number;
}) {
  const path = usePathname();
  const qc = useQueryClient();
  const queryKey = ["binder", studyId, site.id];
  const { data, isLoading, error } = useQuery({ queryKey, queryFn: () => apiFetch<Binder>(`/api/v1/studies/${studyId}/binder/sites/${site.id}`) });
  const refresh = () => {
    void qc.invalidateQueries({ queryKey });
    void qc.invalidateQueries({ queryKey: ["binder-matrix", studyId] });
  };
  const [stateFilter, setStateFilter] = useState<ItemState | "">("");

  return (
    <div className="space-y-4">
      {sites.length > 1 && (
        <nav aria-label="Sites" className="flex flex-wrap gap-2 text-sm">
          {sites.map((s) => (
            <Link key={s.code} href={`${path}?site=${s.code}`} aria-current={s.code === site.code ? "page" : undefined} className={s.code === site.code ? "btn" : "btn-secondary"}>
              {s.code}
            </Link>
          ))}
        </nav>
      )}
      <h2>
        Site {site.code} · {site.name}
      </h2>
      {isLoading && <p>Loading the binder…</p>}
      {error && <p role="alert">{(error as Error).message}</p>}
      {data && (
        <>
          <div className="card space-y-2" data-testid="binder-summary">
            <p>
              <strong data-testid="binder-ready">
                {data.readyCount} of {data.requiredCount}
              </strong>{" "}
              documents required at {siteStatusLabels[data.site.status]} are in place (accepted and in date). Today at the site: {data.today}.
            </p>
            <ul className="flex flex-wrap gap-3 text-sm">
              {itemStates.map((s) => (
                <li key={s} data-testid={`binder-count-${s}`}>
                  <BinderStateChip state={s} /> {data.counts[s]}
                </li>
              ))}
            </ul>
            <p className="governs">
              Cairn lists what the study&apos;s checklist asks for. The approved protocol, the signed agreement, ICH E6 / ISO 14155 and the ethics committee&apos;s and
              regulators&apos; rules govern which essential documents a site must hold.
            </p>
          </div>
          <ToDo items={data.items} />
          <label className="field w-60">
            <span>Show</span>
            <select className="input" value={stateFilter} onChange={(e) => setStateFilter(e.target.value as ItemState | "")}>
              <option value="">Every item</option>
              {itemStates.map((s) => (
                <option key={s} value={s}>
                  {itemStateLabels[s]}
                </option>
              ))}
            </select>
          </label>
          <table className="table-dense" data-testid="binder-table">
            <thead>
              <tr>
                <th>Document</th>
                <th>Whose</th>
                <th>Required</th>
                <th>State</th>
                <th>Current file</th>
                <th>Valid through</th>
                <th>Earlier versions</th>
                <th>
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {data.items
                .filter((i) => !stateFilter || i.state === stateFilter)
                .map((i) => (
                  <ItemRow key={itemKey(i)} item={i} studyId={studyId} siteId={site.id} canUpload={canUpload} canReview={canReview} maxBytes={maxBytes} onChange={refresh} />
                ))}
            </tbody>
          </table>
        </>
      )}
    </div>
  );
}

function ToDo({ items }: { items: Item[] }) {
  const todo = items.filter((i) => i.required && (blockingStates.includes(i.state) || i.state === "expiring"));
  if (todo.length === 0) return <p className="text-sm">Nothing to do: every required document is in place.</p>;
  return (
    <div className="card">
      <h3 className="mb-1 font-semibold">To do ({todo.length})</h3>
      <ul className="text-sm" data-testid="binder-todo">
        {todo.map((i) => (
          <li key={itemKey(i)}>
            {i.type.name}
            {i.person ? ` — ${i.person.name}` : ""}: {itemStateLabels[i.state].toLowerCase()}
            {i.state === "rejected" && i.current?.reviewReason ? ` (${i.current.reviewReason})` : ""}
            {i.state === "expiring" && i.daysToExpiry !== null ? ` (${i.daysToExpiry} days left)` : ""}
          </li>
        ))}
      </ul>
    </div>
  );
}

function ItemRow({ item, studyId, siteId, canUpload, canReview, maxBytes, onChange }: { item: Item; studyId: string; siteId: string; canUpload: boolean; canReview: boolean; maxBytes: number; onChange: () => void }) {
  const [open, setOpen] = useState(false);
  const [issuedOn, setIssuedOn] = useState("");
  const [expiresOn, setExpiresOn] = useState("");
  const [rejecting, setRejecting] = useState(false);
  const [reason, setReason] = useState("");
  const [message, setMessage] = useState<string | null>(null);
  const c = item.current;
  const proposed = item.type.expires && issuedOn && item.type.validityMonths && !expiresOn ? proposedExpiry(issuedOn, item.type.validityMonths) : null;
  const noPerson = item.type.holder === "person" && !item.person;

  async function decide(decision: "accepted" | "rejected") {
    if (!c) return;
    setMessage(null);
    try {
      await apiFetch(`/api/v1/documents/${c.id}/review`, { method: "POST", json: { decision, reason } });
      setRejecting(false);
      setReason("");
      onChange();
    } catch (e) {
      setMessage((e as Error).message);
    }
  }

  return (
    <>
      <tr data-testid={`binder-item-${item.type.code}-${item.person?.userId ?? "site"}`} data-state={item.state}>
        <td title={item.type.reference}>{item.type.name}</td>
        <td>{item.type.holder === "site" ? "Site" : (item.person?.name ?? "Nobody in the role yet")}</td>
        <td>{item.type.requiredFrom ? `From ${siteStatusLabels[item.type.requiredFrom]}${item.required ? "" : " (not yet)"}` : "Optional"}</td>
        <td>
          {item.required || c ? <BinderStateChip state={item.state} /> : <span className="text-xs text-muted">{item.type.requiredFrom ? "Not required yet" : "None held"}</span>}
          {item.state === "rejected" && c?.reviewReason && <div className="text-xs">Reason: {c.reviewReason}</div>}
        </td>
        <td>
          {c ? (
            <>
              <DownloadLink documentId={c.id} fileName={c.fileName} />
              <div className="text-xs text-muted">
                {c.uploaderName} · {when(c.createdAt)} UTC{c.issuedOn ? ` · issued ${c.issuedOn}` : ""}
              </div>
            </>
          ) : (
            "—"
          )}
        </td>
        <td>
          {c?.expiresOn ?? "—"}
          {item.daysToExpiry !== null && item.daysToExpiry >= 0 && <div className="text-xs text-muted">{item.daysToExpiry} days left</div>}
        </td>
        <td>
          {item.earlier.length === 0 ? (
            "—"
          ) : (
            <details>
              <summary>{item.earlier.length}</summary>
              <ul className="text-xs">
                {item.earlier.map((d) => (
                  <li key={d.id}>
                    <DownloadLink documentId={d.id} fileName={d.fileName} /> {when(d.createdAt)} ({d.reviewState.replace("_", " ")})
                  </li>
                ))}
              </ul>
            </details>
          )}
        </td>
        <td className="space-x-1 whitespace-nowrap">
          {canUpload && !noPerson && (
            <button type="button" className="btn-secondary" onClick={() => setOpen((o) => !o)} aria-expanded={open}>
              {c ? "New version" : "Upload"}
            </button>
          )}
          {canReview && c?.reviewState === "awaiting_review" && (
            <>
              <button type="button" className="btn" onClick={() => void decide("accepted")}>
                Accept
              </button>
              <button type="button" className="btn-danger" onClick={() => setRejecting((r) => !r)} aria-expanded={rejecting}>
                Reject…
              </button>
            </>
          )}
        </td>
      </tr>
      {(open || rejecting || message) && (
        <tr>
          <td colSpan={8} className="bg-paper">
            {open && (
              <div className="flex flex-wrap items-end gap-3">
                <label className="field">
                  <span>Issued on</span>
                  <input className="input" type="date" value={issuedOn} onChange={(e) => setIssuedOn(e.target.value)} name="issuedOn" />
                </label>
                {item.type.expires && (
                  <label className="field">
                    <span>Valid through</span>
                    <input className="input" type="date" value={expiresOn} onChange={(e) => setExpiresOn(e.target.value)} name="expiresOn" />
                    {proposed && <span className="text-xs text-muted">Proposed: {proposed} (usual validity {item.type.validityMonths} months)</span>}
                  </label>
                )}
                <DocumentUpload
                  studyId={studyId}
                  siteId={siteId}
                  purpose={item.type.code}
                  maxBytes={maxBytes}
                  label="Choose the file"
                  testId="binder-upload"
                  binder={{ documentTypeId: item.type.id, personId: item.person?.userId ?? null, issuedOn: issuedOn || null, expiresOn: expiresOn || proposed || null }}
                  onUploaded={() => {
                    setOpen(false);
                    onChange();
                  }}
                />
              </div>
            )}
            {rejecting && (
              <div className="flex flex-wrap items-end gap-3">
                <label className="field min-w-80 flex-1">
                  <span>Why is it rejected? (the site sees this)</span>
                  <input className="input" value={reason} onChange={(e) => setReason(e.target.value)} name="reason" />
                </label>
                <button type="button" className="btn-danger" onClick={() => void decide("rejected")}>
                  Reject the document
                </button>
              </div>
            )}
            {message && (
              <p role="alert" className="text-sm text-brick-dark">
                {message}
              </p>
            )}
          </td>
        </tr>
      )}
    </>
  );
}
