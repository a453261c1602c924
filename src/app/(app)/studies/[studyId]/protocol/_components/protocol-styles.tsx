import { sectionNumberingCss } from "@/lib/protocol/sections";

// Section numbers (shared with the editor) and the look of read-only protocol text and redlines.
// Insertions are underlined and deletions struck through, so colour is never the only cue.
const css = `${sectionNumberingCss}
.cairn-protocol { font-size: 0.95rem; line-height: 1.55; }
.cairn-protocol h1 { font-size: 1.25rem; font-weight: 700; margin: 1.25rem 0 0.5rem; }
.cairn-protocol h2 { font-size: 1.1rem; font-weight: 700; margin: 1rem 0 0.4rem; }
.cairn-protocol h3 { font-size: 1rem; font-weight: 700; margin: 0.8rem 0 0.3rem; }
.cairn-protocol p { margin: 0.4rem 0; }
.cairn-protocol ul { list-style: disc; padding-left: 1.5rem; }
.cairn-protocol ol { list-style: decimal; padding-left: 1.5rem; }
.cairn-protocol table { border-collapse: collapse; margin: 0.5rem 0; width: 100%; }
.cairn-protocol th, .cairn-protocol td { border: 1px solid #C9C4BA; padding: 0.25rem 0.5rem; vertical-align: top; text-align: left; }
.cairn-protocol td > p, .cairn-protocol th > p { margin: 0; }
.cairn-protocol .whitespace-pre-wrap { tab-size: 4; }
.cairn-protocol table.redline-table { margin: 0; font-size: 0.85rem; }
.cairn-protocol th { background: #FAF8F4; font-weight: 600; }
.cairn-protocol a { color: #3D5A80; text-decoration: underline; }
.cairn-protocol .selectedCell { background: #E6EEF6; }
.cairn-protocol:focus { outline: none; }
ins.redline-ins { text-decoration: underline; text-decoration-thickness: 2px; color: #2B4260; background: #E6EEF6; }
del.redline-del { text-decoration: line-through; color: #7E2F20; background: #F6E4DF; }
`;

export function ProtocolStyles() {
  return <style dangerouslySetInnerHTML={{ __html: css }} />;
}
