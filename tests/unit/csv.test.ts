import { describe, expect, it } from "vitest";
import { csvCell, csvRow, toCsv } from "@/lib/csv";

// RFC 4180 §2 (rules 6 and 7: fields with comma, quote or line break are quoted; quotes doubled;
// CRLF line ends) and OWASP "CSV Injection" (cells starting with = + - @ tab CR are prefixed with an
// apostrophe so spreadsheets show them as text).
describe("the one CSV writer", () => {
  it("quotes what RFC 4180 says must be quoted", () => {
    expect(csvCell("a,b")).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell("two\r\nlines")).toBe('"two\r\nlines"');
    expect(csvCell("plain")).toBe("plain");
  });
  it.each(["=1+1", "+1+1", "-1+cmd|' /C calc'!A0", "@SUM(A1)", "\tx", "\rx", "=HYPERLINK(\"http://x\",\"y\")"])(
    "neutralises the formula %j",
    (cell) => {
      const out = csvCell(cell);
      const unquoted = out.startsWith('"') ? out.slice(1, -1).replace(/""/g, '"') : out;
      expect(unquoted.startsWith("'")).toBe(true);
      expect(unquoted.slice(1)).toBe(cell);
    },
  );
  it("leaves numbers as numbers, negative ones included", () => {
    expect(csvCell(-3)).toBe("-3");
    expect(csvCell("-12.50")).toBe("-12.50");
    expect(csvCell(12n)).toBe("12");
    expect(csvCell(null)).toBe("");
    expect(csvCell(undefined)).toBe("");
  });
  it("writes rows and documents with CRLF line ends", () => {
    expect(csvRow(["a", 1, null])).toBe("a,1,");
    expect(toCsv(["h1", "h2"], [["=x", "y"], ["1", "2"]])).toBe("h1,h2\r\n'=x,y\r\n1,2\r\n");
  });
});
