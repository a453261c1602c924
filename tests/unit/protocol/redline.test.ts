import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { diffWords } from "diff";
import { computeRedline, diffBlockWords, diffVisitSchedules, type WordPart } from "@/lib/protocol/redline";
import { doc, h, p, t, v1Doc, v2Doc, visitsV1, visitsV2 } from "./fixtures";

/** Words of each kind in order, whitespace ignored: what a reader sees as inserted/deleted. */
function wordsByKind(parts: { kind: string; text: string }[]) {
  const out: Record<string, string[]> = { equal: [], inserted: [], deleted: [] };
  for (const part of parts) out[part.kind]!.push(...part.text.split(/\s+/).filter(Boolean));
  return out;
}

/** jsdiff's diffWords (the reference library) in the same shape. */
function referenceWords(before: string, after: string) {
  return wordsByKind(diffWords(before, after).map((c) => ({ kind: c.added ? "inserted" : c.removed ? "deleted" : "equal", text: c.value })));
}

const join = (parts: WordPart[]) => parts.map((x) => x.text).join("");

describe("computeRedline", () => {
  it("finds no change between identical documents", () => {
    const r = computeRedline(v1Doc, structuredClone(v1Doc));
    expect(r.hasChanges).toBe(false);
    expect(r.rows.every((row) => row.kind === "equal")).toBe(true);
    expect(r.rows).toHaveLength(v1Doc.content!.length);
    expect(r.stats).toMatchObject({ changed: 0, inserted: 0, deleted: 0, wordsInserted: 0, wordsDeleted: 0 });
  });

  it("gives the expected block and word changes for a known pair", () => {
    const r = computeRedline(v1Doc, v2Doc);
    const changes = r.rows.filter((row) => row.kind !== "equal");
    expect(changes.map((row) => row.kind)).toEqual(["changed", "changed", "inserted", "deleted"]);

    const [intro, objective, added, removed] = changes;
    expect(intro!.right!.section).toBe("1");
    expect(intro!.right!.parts.filter((x) => x.kind === "inserted").map((x) => x.text)).toEqual(["primary "]);
    expect(intro!.left!.parts.some((x) => x.kind === "deleted")).toBe(false);

    expect(objective!.left!.section).toBe("2");
    expect(objective!.left!.parts.filter((x) => x.kind === "deleted").map((x) => x.text)).toEqual(["twelve"]);
    expect(objective!.right!.parts.filter((x) => x.kind === "inserted").map((x) => x.text)).toEqual(["twenty-four"]);

    expect(added!.left).toBeNull();
    expect(added!.right).toMatchObject({ section: "2", sectionTitle: "Objectives", text: "A secondary objective is reading speed with the implant switched on." });
    expect(removed!.right).toBeNull();
    expect(removed!.left).toMatchObject({ section: "3", text: "Subjects attend the clinic at each scheduled visit." });

    // Inline view: deletion before insertion, in reading order.
    const inlineObjective = r.inline.find((b) => b.kind === "changed" && b.section === "2")!;
    expect(inlineObjective.parts).toEqual([
      { kind: "equal", text: "The primary objective is safety at " },
      { kind: "deleted", text: "twelve" },
      { kind: "inserted", text: "twenty-four" },
      { kind: "equal", text: " months after implantation." },
    ]);
    expect(r.stats).toMatchObject({ changed: 2, inserted: 1, deleted: 1, wordsInserted: 1 + 1 + 11, wordsDeleted: 1 + 8 });
  });

  it("numbers each side with its own version's sections", () => {
    const before = doc(h(1, "Scope"), p("a b c"), h(1, "Design"), p("d e f"));
    const after = doc(h(1, "Scope"), p("a b c"), h(1, "Population"), p("new text"), h(1, "Design"), p("d e f g"));
    const row = computeRedline(before, after).rows.find((x) => x.kind === "changed")!;
    expect(row.left!.section).toBe("2");
    expect(row.right!.section).toBe("3");
    expect(row.right!.sectionTitle).toBe("Design");
  });

  it("marks format-only changes (bold, link, heading level) as changed with equal text", () => {
    const before = doc(h(2, "Safety"), p("Report every event."));
    const after = doc(h(1, "Safety"), p("Report ", t("every", [{ type: "bold" }]), " event."));
    const r = computeRedline(before, after);
    expect(r.rows.map((x) => [x.kind, x.formatOnly])).toEqual([
      ["changed", true],
      ["changed", true],
    ]);
    expect(r.inline[1]!.parts).toEqual([{ kind: "equal", text: "Report every event." }]);
  });

  it("shows unrelated replacement blocks as a deletion and an insertion, not a word soup", () => {
    const r = computeRedline(doc(p("Alpha beta gamma delta.")), doc(p("Completely different wording here.")));
    expect(r.rows.map((x) => x.kind)).toEqual(["deleted", "inserted"]);
  });

  it("pairs edited blocks inside a hunk by similarity", () => {
    const before = doc(p("one two three four five"), p("six seven eight nine ten"));
    const after = doc(p("brand new paragraph entirely unrelated"), p("six seven eight nine eleven"));
    const kinds = computeRedline(before, after).rows.map((x) => x.kind);
    expect(kinds).toEqual(["deleted", "inserted", "changed"]);
  });

  it("leaves out of the inline view a line break replaced by a space, keeping both sides exact", () => {
    const cells = (a: string, b: string) => ({ type: "table", content: [{ type: "tableRow", content: [a, b].map((x) => ({ type: "tableCell", content: [p(x)] })) }] });
    const r = computeRedline(doc(p("Visit day"), cells("Day", "90")), doc(p("Visit day"), cells("Day µ", "91")));
    const row = r.rows[1]!;
    expect(join(row.left!.parts)).toBe("Day\t90");
    expect(join(row.right!.parts)).toBe("Day µ\t91");
    expect(r.inline[1]!.parts.filter((x) => x.kind === "deleted").map((x) => x.text)).toEqual(["90"]);
  });

  it("compares lists and tables as blocks, word by word", () => {
    const list = (a: string, b: string) => ({ type: "bulletList", content: [a, b].map((x) => ({ type: "listItem", content: [p(x)] })) });
    const r = computeRedline(doc(list("Visual acuity test", "Phosphene map")), doc(list("Visual acuity test", "Phosphene map and reading test")));
    expect(r.rows[0]!.kind).toBe("changed");
    expect(wordsByKind(r.inline[0]!.parts).inserted).toEqual(["and", "reading", "test"]);
  });

  it("agrees word by word with jsdiff's diffWords on changed blocks (known pairs)", () => {
    const pairs: [string, string][] = [
      ["The primary objective is safety at twelve months.", "The primary objective is safety at twenty-four months."],
      ["Subjects attend visits at months 3 and 6.", "Subjects attend visits at months 1, 3, 6 and 12."],
      ["Adverse events are reported within 24 hours.", "Serious adverse events are reported to the sponsor within 24 hours."],
      ["Remove this sentence entirely. Keep this one.", "Keep this one."],
    ];
    for (const [before, after] of pairs) {
      const r = computeRedline(doc(p(before)), doc(p(after)));
      const row = r.inline[0]!;
      expect(row.kind).toBe("changed");
      expect(wordsByKind(row.parts)).toEqual(referenceWords(before, after));
    }
  });

  it("agrees with diffWords on generated word edits, and each side rebuilds its text", () => {
    const vocabulary = ["implant", "visit", "window,", "subject", "safety.", "device", "month", "the", "a", "of", "at", "12", "24", "(reading)", "test", "über"];
    const sentence = fc.array(fc.constantFrom(...vocabulary), { minLength: 4, maxLength: 30 });
    const edit = fc.array(fc.tuple(fc.nat(), fc.constantFrom("replace", "insert", "delete"), fc.constantFrom(...vocabulary)), { minLength: 1, maxLength: 4 });
    fc.assert(
      fc.property(sentence, edit, fc.constantFrom(" ", "  ", "\n", " \t"), (words, edits, spacing) => {
        const changed = [...words];
        for (const [at, op, word] of edits) {
          const i = at % (changed.length + 1);
          if (op === "insert") changed.splice(i, 0, word);
          else if (op === "delete" && changed.length > 1) changed.splice(Math.min(i, changed.length - 1), 1);
          else changed[Math.min(i, changed.length - 1)] = word;
        }
        const before = words.join(" ");
        const after = changed.join(spacing);
        const parts = diffBlockWords(before, after);
        expect(join(parts.filter((x) => x.kind !== "inserted"))).toBe(before);
        expect(join(parts.filter((x) => x.kind !== "deleted"))).toBe(after);
        expect(wordsByKind(parts)).toEqual(referenceWords(before, after));
      }),
      { numRuns: 1000 },
    );
  });

  it("always rebuilds both documents' texts from the side-by-side rows", () => {
    const para = fc.array(fc.constantFrom("alpha", "beta", "gamma", "delta", "visit", "implant"), { minLength: 1, maxLength: 8 }).map((w) => p(w.join(" ")));
    const block = fc.oneof(para, fc.constantFrom(h(1, "Scope"), h(2, "Design"), h(3, "Visits")));
    fc.assert(
      fc.property(fc.array(block, { minLength: 1, maxLength: 12 }), fc.array(block, { minLength: 1, maxLength: 12 }), (a, b) => {
        const r = computeRedline(doc(...a), doc(...b));
        const left = r.rows.filter((x) => x.left).map((x) => join(x.left!.parts));
        const right = r.rows.filter((x) => x.right).map((x) => join(x.right!.parts));
        expect(left).toEqual(a.map((n) => n.content?.map((c) => c.text).join("") ?? ""));
        expect(right).toEqual(b.map((n) => n.content?.map((c) => c.text).join("") ?? ""));
        expect(r.hasChanges).toBe(JSON.stringify(a) !== JSON.stringify(b));
      }),
      { numRuns: 300 },
    );
  });
});

describe("diffVisitSchedules", () => {
  it("lists added, removed and changed visits field by field", () => {
    const d = diffVisitSchedules(visitsV1, visitsV2);
    expect(d.added.map((v) => v.code)).toEqual(["M6"]);
    expect(d.removed).toEqual([]);
    expect(d.unchanged).toEqual(["SCR", "IMP"]);
    expect(d.changed).toHaveLength(1);
    expect(d.changed[0]!.code).toBe("M3");
    expect(d.changed[0]!.fields).toEqual([
      { field: "windowBefore", before: 7, after: 14 },
      { field: "windowAfter", before: 7, after: 14 },
      { field: "procedures", before: ["Phosphene mapping"], after: ["Phosphene mapping", "Reading test"] },
    ]);
    expect(d.orderChanged).toBe(false);
    expect(d.hasChanges).toBe(true);
  });

  it("sees removals and reordering, and nothing between equal schedules", () => {
    const back = diffVisitSchedules(visitsV2, visitsV1);
    expect(back.removed.map((v) => v.code)).toEqual(["M6"]);
    expect(back.added).toEqual([]);
    const reordered = diffVisitSchedules(visitsV1, [visitsV1[1]!, visitsV1[0]!, visitsV1[2]!]);
    expect(reordered).toMatchObject({ added: [], removed: [], changed: [], orderChanged: true, hasChanges: true });
    expect(diffVisitSchedules(visitsV1, structuredClone(visitsV1)).hasChanges).toBe(false);
  });
});
