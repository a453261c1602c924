import { describe, expect, it } from "vitest";
import { buildSignaturePagePdf, type SignaturePageInput } from "@/lib/acknowledgements/signature-page-pdf";

/** Text drawn in standard fonts (the hashes, in Courier) is written as hex WinAnsi strings in the page streams. */
function standardFontText(pdf: Buffer): string {
  const body = pdf.toString("latin1");
  return [...body.matchAll(/<([0-9a-fA-F]+)>/g)].map((m) => Buffer.from(m[1]!, "hex").toString("latin1")).join("");
}

const released = "a".repeat(64);
const base: SignaturePageInput = {
  studyCode: "TEST-1",
  studyTitle: "Test study",
  versionLabel: "2.0",
  versionTitle: "Test protocol",
  contentHash: released,
  site: { code: "DE99", name: "Test site", timeZone: "Europe/Berlin" },
  signatures: [],
  unsigned: [],
  generatedAt: "2026-12-01T10:00:00.000Z",
  compress: false,
};
const sig = (hash: string, id: string) => ({ printedName: "Dr. Test", role: "Investigator", signedAtUtc: "2026-12-01 09:00:00 UTC", signedAtSiteLocal: "2026-12-01 10:00:00 +01:00", meaning: "I have read …", contentHash: hash, signatureId: id });

describe("signature page PDF", () => {
  it("prints the released hash and each signature's hash, saying whether they match", async () => {
    const pdf = await buildSignaturePagePdf({ ...base, signatures: [sig(released, "sig-1"), sig("b".repeat(64), "sig-2")] });
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const text = standardFontText(pdf);
    expect(text.split(released).length - 1).toBe(2);
    expect(text).toContain(`${released} (matches the released content)`);
    expect(text).toContain(`${"b".repeat(64)} (DOES NOT MATCH the released content)`);
    expect(text).toContain("Signature record sig-1");
    expect(text).toContain("Signature record sig-2");
  });

  it("with no signature yet, still prints the version's hash", async () => {
    const text = standardFontText(await buildSignaturePagePdf({ ...base, unsigned: [{ name: "Dr. Later", dueOn: "2026-12-15", state: "14 days left" }] }));
    expect(text).toContain(released);
    expect(text).not.toContain("Signature record");
  });
});
