"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { ColumnDef } from "@tanstack/react-table";
import { useMemo, useState } from "react";
import { DataTable } from "@/components/data-table";
import { StatusChip } from "@/components/status-chip";
import { apiFetch, ApiError } from "@/lib/api/client";
import { isSiteRole, roleLabels, roles, type Role } from "@/lib/auth/roles";

type Person = {
  membershipId: string;
  userId: string;
  name: string;
  email: string;
  role: Role;
  siteId: string | null;
  siteCode: string | null;
  invitationPending: boolean;
};

export function PeopleManager({ studyId, canManage, sites }: { studyId: string; canManage: boolean; sites: { id: string; code: string; name: string }[] }) {
  const qc = useQueryClient();
  const key = ["people", studyId];
  const { data, isLoading, error } = useQuery({ queryKey: key, queryFn: () => apiFetch<{ people: Person[] }>(`/api/v1/studies/${studyId}/people`) });
  const revoke = useMutation({
    mutationFn: (membershipId: string) => apiFetch(`/api/v1/studies/${studyId}/memberships/${membershipId}`, { method: "DELETE" }),
    onSuccess: () => qc.invalidateQueries({ queryKey: key }),
  });

  const columns = useMemo<ColumnDef<Person, unknown>[]>(
    () => [
      { accessorKey: "name", header: "Name" },
      { accessorKey: "email", header: "E-mail" },
      { id: "role", accessorFn: (p) => roleLabels[p.role], header: "Role" },
      { id: "site", accessorFn: (p) => p.siteCode ?? "All sites", header: "Site" },
      {
        id: "state",
        accessorFn: (p) => (p.invitationPending ? "Invited" : "Active"),
        header: "State",
        cell: ({ row }) => (row.original.invitationPending ? <StatusChip tone="attention">Invited</StatusChip> : <StatusChip tone="ok">Active</StatusChip>),
      },
      ...(canManage
        ? [
            {
              id: "actions",
              header: "",
              enableSorting: false,
              cell: ({ row }: { row: { original: Person } }) => (
                <button
                  type="button"
                  className="btn-secondary"
                  onClick={() => {
                    if (confirm(`Revoke ${roleLabels[row.original.role]} from ${row.original.name}?`)) revoke.mutate(row.original.membershipId);
                  }}
                >
                  Revoke
                </button>
              ),
            } satisfies ColumnDef<Person, unknown>,
          ]
        : []),
    ],
    [canManage, revoke],
  );

  return (
    <div className="space-y-6">
      {canManage && <InviteForm studyId={studyId} sites={sites} onDone={() => qc.invalidateQueries({ queryKey: key })} />}
      {revoke.error && (
        <p role="alert" className="text-sm text-brick-dark">
          {(revoke.error as Error).message}
        </p>
      )}
      {isLoading ? <p>Loading people…</p> : error ? <p role="alert">{(error as Error).message}</p> : <DataTable columns={columns} data={data?.people ?? []} testId="people-table" />}
    </div>
  );
}

function InviteForm({ studyId, sites, onDone }: { studyId: string; sites: { id: string; code: string; name: string }[]; onDone: () => void }) {
  const [role, setRole] = useState<Role>("coordinator");
  const [message, setMessage] = useState<{ ok: boolean; text: string; fields?: Record<string, string[]> } | null>(null);
  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const fd = new FormData(form);
    try {
      const res = await apiFetch<{ invitationSent: boolean }>(`/api/v1/studies/${studyId}/people`, {
        method: "POST",
        json: { email: fd.get("email"), name: fd.get("name"), role, siteId: fd.get("siteId") || null },
      });
      setMessage({ ok: true, text: res.invitationSent ? "Invitation e-mail queued." : "Role granted to an existing account." });
      form.reset();
      onDone();
    } catch (err) {
      const e2 = err as ApiError;
      setMessage({ ok: false, text: e2.message, fields: e2.fields });
    }
  }
  return (
    <form onSubmit={onSubmit} className="card grid gap-3 md:grid-cols-5" aria-labelledby="invite-title">
      <h2 id="invite-title" className="md:col-span-5">
        Invite a person or grant a role
      </h2>
      <label className="field">
        <span>Printed name</span>
        <input className="input" name="name" required minLength={2} />
      </label>
      <label className="field">
        <span>E-mail</span>
        <input className="input" name="email" type="email" required />
      </label>
      <label className="field">
        <span>Role</span>
        <select className="input" value={role} onChange={(e) => setRole(e.target.value as Role)}>
          {roles.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Site {isSiteRole(role) ? "(required)" : "(optional)"}</span>
        <select className="input" name="siteId" required={isSiteRole(role)} defaultValue="">
          <option value="">{isSiteRole(role) ? "Choose a site" : "All sites"}</option>
          {sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.code} — {s.name}
            </option>
          ))}
        </select>
      </label>
      <div className="flex items-end">
        <button className="btn" type="submit">
          Invite
        </button>
      </div>
      {message && (
        <p role={message.ok ? "status" : "alert"} className={`md:col-span-5 text-sm ${message.ok ? "text-lichen-dark" : "text-brick-dark"}`}>
          {message.text}
          {message.fields &&
            Object.entries(message.fields).map(([k, v]) => (
              <span key={k} className="block">
                {k}: {v.join(", ")}
              </span>
            ))}
        </p>
      )}
    </form>
  );
}
