"use client";

import type { Editor } from "@tiptap/react";
import { useEditorState } from "@tiptap/react";
import { isSafeHref } from "@/lib/protocol/safe-url";

function Tool({ label, active, disabled, onClick, children }: { label: string; active?: boolean; disabled?: boolean; onClick: () => void; children: React.ReactNode }) {
  return (
    <button
      type="button"
      aria-label={label}
      title={label}
      aria-pressed={active}
      disabled={disabled}
      onMouseDown={(e) => e.preventDefault()}
      onClick={onClick}
      className={`min-w-8 rounded border px-2 py-1 text-sm ${active ? "border-lichen bg-lichen text-white" : "border-rule bg-white text-ink hover:bg-paper"} disabled:opacity-40`}
    >
      {children}
    </button>
  );
}

/** Headings, lists, bold/italic, links and tables: the formatting a protocol needs, nothing more. */
export function EditorToolbar({ editor }: { editor: Editor }) {
  const s = useEditorState({
    editor,
    selector: ({ editor: e }) => ({
      h1: e.isActive("heading", { level: 1 }),
      h2: e.isActive("heading", { level: 2 }),
      h3: e.isActive("heading", { level: 3 }),
      bold: e.isActive("bold"),
      italic: e.isActive("italic"),
      bullet: e.isActive("bulletList"),
      ordered: e.isActive("orderedList"),
      link: e.isActive("link"),
      inTable: e.isActive("table"),
      canUndo: e.can().undo(),
      canRedo: e.can().redo(),
    }),
  });
  const chain = () => editor.chain().focus();
  function setLink() {
    const previous = (editor.getAttributes("link").href as string | undefined) ?? "https://";
    const href = window.prompt("Link address (https://, http:// or mailto:). Leave empty to remove the link.", previous);
    if (href === null) return;
    if (href.trim() === "") return void chain().extendMarkRange("link").unsetLink().run();
    if (!isSafeHref(href.trim())) return void window.alert("Only https://, http:// and mailto: addresses can be linked.");
    chain().extendMarkRange("link").setLink({ href: href.trim() }).run();
  }
  return (
    <div role="toolbar" aria-label="Formatting" className="sticky top-0 z-10 flex flex-wrap gap-1 border-b border-rule bg-white p-2">
      <Tool label="Section heading (level 1)" active={s.h1} onClick={() => chain().toggleHeading({ level: 1 }).run()}>
        H1
      </Tool>
      <Tool label="Subsection heading (level 2)" active={s.h2} onClick={() => chain().toggleHeading({ level: 2 }).run()}>
        H2
      </Tool>
      <Tool label="Sub-subsection heading (level 3)" active={s.h3} onClick={() => chain().toggleHeading({ level: 3 }).run()}>
        H3
      </Tool>
      <Tool label="Paragraph" onClick={() => chain().setParagraph().run()}>
        ¶
      </Tool>
      <span className="mx-1 border-l border-rule" />
      <Tool label="Bold" active={s.bold} onClick={() => chain().toggleBold().run()}>
        <b>B</b>
      </Tool>
      <Tool label="Italic" active={s.italic} onClick={() => chain().toggleItalic().run()}>
        <i>I</i>
      </Tool>
      <Tool label="Link" active={s.link} onClick={setLink}>
        Link
      </Tool>
      <span className="mx-1 border-l border-rule" />
      <Tool label="Bulleted list" active={s.bullet} onClick={() => chain().toggleBulletList().run()}>
        • List
      </Tool>
      <Tool label="Numbered list" active={s.ordered} onClick={() => chain().toggleOrderedList().run()}>
        1. List
      </Tool>
      <span className="mx-1 border-l border-rule" />
      <Tool label="Insert table" onClick={() => chain().insertTable({ rows: 3, cols: 3, withHeaderRow: true }).run()}>
        Table
      </Tool>
      <Tool label="Add row below" disabled={!s.inTable} onClick={() => chain().addRowAfter().run()}>
        +Row
      </Tool>
      <Tool label="Add column right" disabled={!s.inTable} onClick={() => chain().addColumnAfter().run()}>
        +Col
      </Tool>
      <Tool label="Delete row" disabled={!s.inTable} onClick={() => chain().deleteRow().run()}>
        −Row
      </Tool>
      <Tool label="Delete column" disabled={!s.inTable} onClick={() => chain().deleteColumn().run()}>
        −Col
      </Tool>
      <Tool label="Delete table" disabled={!s.inTable} onClick={() => chain().deleteTable().run()}>
        ✕Table
      </Tool>
      <span className="mx-1 border-l border-rule" />
      <Tool label="Undo" disabled={!s.canUndo} onClick={() => chain().undo().run()}>
        Undo
      </Tool>
      <Tool label="Redo" disabled={!s.canRedo} onClick={() => chain().redo().run()}>
        Redo
      </Tool>
    </div>
  );
}
