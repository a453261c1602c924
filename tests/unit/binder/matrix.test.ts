import { describe, expect, it } from "vitest";
import { buildMatrix, computeSiteBinder, filterMatrix, matrixCsv, type BinderType } from "@/lib/binder";
import { csvCell } from "@/lib/csv";

const types: BinderType[] = [
  { id: "t1", code: "investigator_agreement", name: "Signed agreement, final", holder: "site", appliesToRoles: [], requiredFrom: "start_up", expires: false },
  { id: "t2", code: "gcp_training", name: "GCP training", holder: "person", appliesToRoles: ["investigator"], requiredFrom: "start_up", expires: true },
];
const people = [
  { userId: "u1", name: "A", roles: ["investigator" as const] },
  { userId: "u2", name: "B", roles: ["investigator" as const] },
];

describe("study matrix", () => {
  const a = computeSiteBinder({
    today: "2026-06-30",
    status: "open",
    types,
    people,
    documents: [
      { id: "d1", documentTypeId: "t1", personId: null, fileName: "a.pdf", createdAt: "2026-01-01T00:00:00Z", reviewState: "accepted", issuedOn: null, expiresOn: null },
      { id: "d2", documentTypeId: "t2", personId: "u1", fileName: "g.pdf", createdAt: "2026-01-01T00:00:00Z", reviewState: "accepted", issuedOn: null, expiresOn: "2026-06-29" },
    ],
  });
  const b = computeSiteBinder({ today: "2026-06-30", status: "start_up", types, people: [], documents: [] });
  const rows = buildMatrix(
    [
      { id: "sa", code: "DE01", name: "Site A", status: "open", binder: a },
      { id: "sb", code: "NL01", name: "Site B", status: "start_up", binder: b },
    ],
    ["t1", "t2"],
  );

  it("counts items per site and type", () => {
    expect(rows[0]!.cells[0]!.counts.complete).toBe(1);
    expect(rows[0]!.cells[1]!.counts).toMatchObject({ expired: 1, missing: 1 });
    expect(rows[1]!.cells[1]!.counts.missing).toBe(1); // nobody holds the role yet
  });

  it("filters by state and site code", () => {
    expect(filterMatrix(rows, { state: "expired" }).map((r) => r.code)).toEqual(["DE01"]);
    expect(filterMatrix(rows, { state: "missing" }).map((r) => r.code)).toEqual(["DE01", "NL01"]);
    expect(filterMatrix(rows, { siteCode: "nl" }).map((r) => r.code)).toEqual(["NL01"]);
  });

  it("exports CSV with quoted fields and CRLF line ends (RFC 4180 §2)", () => {
    const csv = matrixCsv(rows, types);
    const lines = csv.split("\r\n");
    expect(lines[0]).toBe("site_code,site_name,site_status,document_type,document_name,required,missing,rejected,awaiting_review,expired,expiring,complete");
    expect(lines[1]).toBe('DE01,Site A,open,investigator_agreement,"Signed agreement, final",yes,0,0,0,0,0,1');
    expect(lines).toHaveLength(6); // header, 4 cells, trailing empty
  });

  it("escapes quotes and neutralises spreadsheet formulas", () => {
    expect(csvCell('say "hi"')).toBe('"say ""hi"""'); // RFC 4180 §2 rule 7
    expect(csvCell("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)"); // OWASP CSV injection advice
    expect(csvCell(12)).toBe("12");
  });
});
