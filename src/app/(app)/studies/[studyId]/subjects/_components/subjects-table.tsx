"use client";

import type { ColumnDef } from "@tanstack/react-table";
import Link from "next/link";
import { useMemo } from "react";
import { DataTable } from "@/components/data-table";
import { subjectStatusLabels, type SubjectStatus } from "@/lib/subjects/subject-states";
import type { VisitState } from "@/lib/visits/subject-calendar";
import { SubjectStatusChip, VisitStateChip } from "./subject-status-chip";

export type SubjectRow = {
  id: string;
  code: string;
  siteCode: string;
  status: SubjectStatus;
  consentDate: string;
  enrolmentDate: string | null;
  implantDate: string | null;
  nextVisit: { visitCode: string; targetDate: string | null; state: string } | null;
  overdue: number;
  outOfWindow: number;
};

export function SubjectsTable({ studyId, rows }: { studyId: string; rows: SubjectRow[] }) {
  const columns = useMemo<ColumnDef<SubjectRow, unknown>[]>(
    () => [
      {
        accessorKey: "code",
        header: "Subject",
        cell: ({ row }) => (
          <Link className="font-mono underline" href={`/studies/${studyId}/subjects/${row.original.id}`}>
            {row.original.code}
          </Link>
        ),
      },
      { accessorKey: "siteCode", header: "Site" },
      { id: "status", accessorFn: (r) => subjectStatusLabels[r.status], header: "Status", cell: ({ row }) => <SubjectStatusChip status={row.original.status} /> },
      { accessorKey: "consentDate", header: "Consent" },
      { accessorKey: "enrolmentDate", header: "Enrolled" },
      { accessorKey: "implantDate", header: "Implant" },
      {
        id: "next",
        header: "Next visit",
        accessorFn: (r) => (r.nextVisit ? `${r.nextVisit.targetDate ?? ""} ${r.nextVisit.visitCode}` : ""),
        cell: ({ row }) =>
          row.original.nextVisit ? (
            <span className="inline-flex items-center gap-2">
              <span className="font-mono">{row.original.nextVisit.visitCode}</span> {row.original.nextVisit.targetDate}{" "}
              <VisitStateChip state={row.original.nextVisit.state as VisitState} />
            </span>
          ) : (
            "—"
          ),
      },
      { accessorKey: "overdue", header: "Overdue", meta: { align: "right" } },
      { accessorKey: "outOfWindow", header: "Out of window", meta: { align: "right" } },
    ],
    [studyId],
  );
  return <DataTable columns={columns} data={rows} testId="subjects-table" filterLabel="Filter subjects" emptyText="No subjects yet." />;
}
