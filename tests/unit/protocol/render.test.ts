import { describe, expect, it } from "vitest";
import { renderProtocolArticle, renderProtocolHtml } from "@/lib/protocol/render";
import { sanitizeProtocolDoc } from "@/lib/protocol/sanitize";
import { safeHref } from "@/lib/protocol/safe-url";
import { doc, h, p, t, v1Doc } from "./fixtures";

// Classic script-injection vectors of the OWASP XSS Filter Evasion Cheat Sheet (from memory).
const owaspVectors = [
  `<SCRIPT SRC=http://xss.rocks/xss.js></SCRIPT>`,
  `<IMG SRC="javascript:alert('XSS');">`,
  `<IMG SRC=JaVaScRiPt:alert('XSS')>`,
  `<IMG SRC=javascript:alert(&quot;XSS&quot;)>`,
  `<IMG """><SCRIPT>alert("XSS")</SCRIPT>"\\>`,
  `<IMG SRC=# onmouseover="alert('xxs')">`,
  `<IMG SRC=/ onerror="alert(String.fromCharCode(88,83,83))"></img>`,
  `<IMG SRC=&#106;&#97;&#118;&#97;&#115;&#99;&#114;&#105;&#112;&#116;&#58;&#97;&#108;&#101;&#114;&#116;&#40;&#39;&#88;&#83;&#83;&#39;&#41;>`,
  `<IMG SRC=&#x6A&#x61&#x76&#x61&#x73&#x63&#x72&#x69&#x70&#x74&#x3A&#x61&#x6C&#x65&#x72&#x74&#x28&#x27&#x58&#x53&#x53&#x27&#x29>`,
  `<IMG SRC="jav\tascript:alert('XSS');">`,
  `<IMG SRC="jav&#x0A;ascript:alert('XSS');">`,
  `<BODY onload!#$%&()*~+-_.,:;?@[/|\\]^\`=alert("XSS")>`,
  `<<SCRIPT>alert("XSS");//\\<</SCRIPT>`,
  `</TITLE><SCRIPT>alert("XSS");</SCRIPT>`,
  `<svg/onload=alert('XSS')>`,
  `<IFRAME SRC="javascript:alert('XSS');"></IFRAME>`,
  `<META HTTP-EQUIV="refresh" CONTENT="0;url=data:text/html base64,PHNjcmlwdD5hbGVydCgnWFNTJyk8L3NjcmlwdD4K">`,
  `<DIV STYLE="background-image: url(javascript:alert('XSS'))">`,
  `"><script>alert(1)</script>`,
  `'';!--"<XSS>=&{()}`,
];

// The same cheat sheet's URL forms, placed in link hrefs.
const hostileHrefs = [
  "javascript:alert('XSS')",
  "JaVaScRiPt:alert('XSS')",
  " javascript:alert(1)",
  "jav\tascript:alert('XSS');",
  "jav\nascript:alert('XSS');",
  "jav\rascript:alert('XSS');",
  "java\u0000script:alert('XSS')",
  "\u000e  javascript:alert('XSS');",
  "&#106;&#97;&#118;&#97;&#115;&#99;&#114;&#105;&#112;&#116;&#58;alert(1)",
  "&#x6A&#x61&#x76&#x61&#x73&#x63&#x72&#x69&#x70&#x74&#x3A;alert(1)",
  "javascript&colon;alert(1)",
  "vbscript:msgbox(\"XSS\")",
  "data:text/html;base64,PHNjcmlwdD5hbGVydCgnWFNTJyk8L3NjcmlwdD4K",
  "DATA:text/html,<script>alert(1)</script>",
  "//xss.rocks/xss.js",
  "livescript:alert(1)",
];

const allowedTags = new Set(["p", "h1", "h2", "h3", "strong", "em", "a", "ul", "ol", "li", "br", "table", "tbody", "tr", "th", "td", "colgroup", "col", "div"]);
const allowedAttrs = new Set(["href", "rel", "id", "data-section", "start", "colspan", "rowspan", "style", "class"]);

/** Every tag and attribute of the output, checked against a whitelist (text is escaped, so each "<" opens a real tag). */
function assertInert(html: string) {
  expect(html).not.toMatch(/<script/i);
  for (const [tag, name, attrText] of html.matchAll(/<\/?([a-zA-Z0-9-]+)([^>]*)>/g)) {
    expect(allowedTags, `tag ${tag}`).toContain(name!.toLowerCase());
    const attrs = [...attrText!.matchAll(/\s([^\s=]+)="([^"]*)"/g)];
    // Nothing but name="value" pairs: no bare or unquoted attributes slipped through.
    expect(attrText!.replace(/\s([^\s=]+)="([^"]*)"/g, "").replace(/\/$/, "").trim(), `attributes of ${tag}`).toBe("");
    for (const [, attr, value] of attrs) {
      expect(allowedAttrs, `attribute ${attr} in ${tag}`).toContain(attr!.toLowerCase());
      expect(attr!.toLowerCase().startsWith("on")).toBe(false);
      if (attr === "href") expect(value!).toMatch(/^(https?:\/\/|mailto:)/);
      if (attr === "style") expect(value!).toMatch(/^(min-)?width: \d+px;?( min-width: \d+px;?)?$/);
    }
  }
  const tags = [...html.matchAll(/<[^>]*>/g)].map((m) => m[0]).join("");
  expect(tags).not.toMatch(/(javascript|vbscript|data):/i);
}

describe("renderProtocolHtml", () => {
  it("renders headings with section numbers, marks, lists, tables and safe links", () => {
    const html = renderProtocolHtml(
      doc(
        h(1, "Introduction"),
        p("See ", t("the device notes", [{ type: "link", attrs: { href: "https://example.org/notes" } }]), " and ", t("this", [{ type: "bold" }]), "."),
        h(2, "Background"),
        { type: "orderedList", attrs: { start: 3 }, content: [{ type: "listItem", content: [p("third")] }] },
        { type: "table", content: [{ type: "tableRow", content: [{ type: "tableHeader", content: [p("Visit")] }, { type: "tableCell", attrs: { colspan: 1 }, content: [p("Day")] }] }] },
      ),
    );
    expect(html).toContain('<h1 id="section-1" data-section="1">Introduction</h1>');
    expect(html).toContain('<h2 id="section-1-1" data-section="1.1">Background</h2>');
    expect(html).toContain('<a rel="noopener noreferrer nofollow" href="https://example.org/notes">the device notes</a>');
    expect(html).toContain("<strong>this</strong>");
    expect(html).toContain('<ol start="3"><li><p>third</p></li></ol>');
    expect(html).toMatch(/<table[^>]*>.*<th[^>]*><p>Visit<\/p><\/th><td[^>]*><p>Day<\/p><\/td>/);
    assertInert(html);
  });

  it("wraps the article in the section-numbering class", () => {
    expect(renderProtocolArticle(v1Doc)).toMatch(/^<div class="cairn-section-numbers cairn-protocol"><p>/);
  });

  it.each(owaspVectors)("escapes OWASP vector in text: %s", (vector) => {
    const html = renderProtocolHtml(doc(p(vector), h(1, vector)));
    assertInert(html);
    expect(html).toContain(vector.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;"));
  });

  it.each(hostileHrefs)("drops the link but keeps the text for href %j", (href) => {
    const html = renderProtocolHtml(doc(p(t("click me", [{ type: "link", attrs: { href } }]))));
    assertInert(html);
    expect(html).toBe("<p>click me</p>");
  });

  it("keeps a quote-breaking http link inert: the quotes are percent-encoded", () => {
    const html = renderProtocolHtml(doc(p(t("x", [{ type: "link", attrs: { href: 'https://example.org/"onmouseover="alert(1)' } }]))));
    assertInert(html);
    expect(html).toContain('href="https://example.org/%22onmouseover=%22alert(1)"');
  });

  it("keeps http, https and mailto links", () => {
    for (const href of ["http://example.org/", "https://example.org/a?b=1&c=2", "mailto:trial-office@example.org"]) {
      const html = renderProtocolHtml(doc(p(t("x", [{ type: "link", attrs: { href } }]))));
      assertInert(html);
      expect(html).toContain(`href="${href.replace(/&/g, "&amp;")}"`);
    }
  });

  it("drops hostile attributes and unknown nodes and marks", () => {
    const hostile = {
      type: "doc",
      content: [
        { type: "paragraph", attrs: { onclick: "alert(1)", style: "background:url(javascript:alert(1))", class: "x" }, content: [{ type: "text", text: "kept" }] },
        { type: "heading", attrs: { level: 1, onmouseover: "alert(1)", id: "x\" onload=\"alert(1)" }, content: [{ type: "text", text: "Title" }] },
        { type: "script", content: [{ type: "text", text: "alert(1)" }] },
        { type: "iframe", attrs: { src: "javascript:alert(1)" } },
        { type: "image", attrs: { src: "x", onerror: "alert(1)" } },
        { type: "htmlBlock", attrs: { html: "<script>alert(1)</script>" } },
        { type: "codeBlock", content: [{ type: "text", text: "<img src=x onerror=alert(1)>" }] },
        {
          type: "paragraph",
          content: [
            { type: "text", text: "marked", marks: [{ type: "textStyle", attrs: { style: "x:expression(alert(1))" } }, { type: "italic", attrs: { onclick: "alert(1)" } }] },
            { type: "mention", attrs: { id: "<script>" } },
            { type: "text", text: "" },
            { type: "text", text: 42 },
          ],
        },
        { type: "table", attrs: { onclick: "x" }, content: [{ type: "tableRow", content: [{ type: "tableCell", attrs: { colspan: "2\" onclick=\"x", rowspan: -1, colwidth: ["1px;x"] } }] }] },
        { type: "orderedList", attrs: { start: "1\" onclick=\"x", type: "a\" onclick=\"x" }, content: [{ type: "listItem", content: [{ type: "paragraph" }] }, { type: "div" }] },
      ],
    };
    const html = renderProtocolHtml(hostile);
    assertInert(html);
    expect(html).toContain("<p>kept</p>");
    expect(html).toContain('<h1 id="section-1" data-section="1">Title</h1>');
    expect(html).toContain("<p><em>marked</em></p>");
    expect(html).not.toContain("alert");
    expect(html).not.toContain("onerror");
  });

  it("never throws on junk and renders an empty paragraph", () => {
    for (const junk of [null, 42, "doc", [], { type: "paragraph" }, { type: "doc", content: "x" }, { type: "doc", content: [null, 1, "x"] }]) {
      expect(renderProtocolHtml(junk)).toBe("<p></p>");
    }
  });

  it("cuts absurdly deep nesting instead of overflowing", () => {
    let node: Record<string, unknown> = { type: "paragraph", content: [{ type: "text", text: "deep" }] };
    for (let i = 0; i < 5000; i++) node = { type: "bulletList", content: [{ type: "listItem", content: [node] }] };
    const html = renderProtocolHtml({ type: "doc", content: [node] });
    assertInert(html);
    expect(html).not.toContain("deep");
  });
});

describe("sanitizeProtocolDoc / safeHref", () => {
  it("is idempotent on stored documents", () => {
    const once = sanitizeProtocolDoc(v1Doc);
    expect(sanitizeProtocolDoc(once)).toEqual(once);
    expect(once).toEqual(v1Doc);
  });

  it("normalises allowed URLs and refuses the rest", () => {
    expect(safeHref("HTTPS://Example.org")).toBe("https://example.org/");
    expect(safeHref("mailto:a@example.org")).toBe("mailto:a@example.org");
    expect(safeHref(" https://example.org/a b ")).toBe("https://example.org/a%20b");
    expect(safeHref("ht\ttps://example.org")).toBe("https://example.org/"); // a browser reads it the same way
    expect(safeHref("mailto:office@example.org?subject=Protocol change")).toBe("mailto:office@example.org?subject=Protocol%20change");
    expect(safeHref("https:")).toBeNull();
    expect(safeHref("https ://example.org")).toBeNull();
    expect(safeHref("ftp://example.org")).toBeNull();
    expect(safeHref("/relative")).toBeNull();
    expect(safeHref(undefined)).toBeNull();
  });
});
