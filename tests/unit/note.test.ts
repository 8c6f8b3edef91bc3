import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { NoteView } from "@/components/rich-text/note-view";
import { toErrorBody } from "@/lib/error-body";
import { AppError } from "@/lib/errors";
import { editorAllowsHref } from "@/lib/rich-text/extensions";
import { hrefFromInput, safeHref } from "@/lib/rich-text/href";
import {
  NOTE_LIMITS,
  NOTE_MARK_TYPES,
  NOTE_NODE_TYPES,
  getNoteSchema,
  noteExcerpt,
  noteInputSchema,
  noteText,
  parseNote,
  type NoteDoc,
} from "@/lib/rich-text/note";

const doc = (...content: unknown[]) => ({ type: "doc", content });
const text = (value: string, marks?: unknown[]) => ({ type: "text", text: value, ...(marks ? { marks } : {}) });
const para = (...content: unknown[]) => ({ type: "paragraph", content });
const item = (...content: unknown[]) => ({ type: "listItem", content });
const link = (href: string) => ({ type: "link", attrs: { href } });

/** The message parseNote refuses `input` with (fails the test if it is accepted). */
function refusal(input: unknown): string {
  try {
    parseNote(input);
  } catch (error) {
    expect(error).toBeInstanceOf(AppError);
    const appError = error as AppError;
    expect(appError.status).toBe(422);
    expect(appError.fields?.note?.[0]).toBe(appError.message);
    return appError.message;
  }
  throw new Error(`accepted: ${JSON.stringify(input).slice(0, 120)}`);
}

// What the editor's getJSON() produces for a typical note (link attrs as tiptap fills them in).
const editorNote = doc(
  { type: "heading", attrs: { level: 2 }, content: [text("Intake")] },
  para(text("Front brake lever feels "), text("spongy", [{ type: "bold" }, { type: "italic" }]), { type: "hardBreak" }, text("fluid is dark.")),
  { type: "heading", attrs: { level: 3 }, content: [text("Plan")] },
  { type: "bulletList", content: [item(para(text("Bleed the front line"))), item(para(text("Check pads")))] },
  { type: "orderedList", attrs: { start: 1, type: null }, content: [item(para(text("Flush"))), item(para(text("Test ride")))] },
  { type: "blockquote", content: [para(text("It pulls to the bar since the spring."))] },
  para(
    text("Parts list: "),
    text("supplier page", [
      { type: "link", attrs: { href: "https://parts.example.test/pads?size=2", target: "_blank", rel: "noopener noreferrer nofollow ugc", class: null, title: null } },
    ]),
  ),
);

describe("parseNote accepts what the editor makes", () => {
  it("keeps headings, bold/italic, lists, a quote and a link; drops the link's target/rel/class/title", () => {
    const parsed = parseNote(editorNote);
    expect(parsed.content).toHaveLength(7);
    const last = parsed.content![6]!;
    expect(last).toEqual(para(text("Parts list: "), text("supplier page", [link("https://parts.example.test/pads?size=2")])));
    // The JSON string of a hidden form field works the same.
    expect(parseNote(JSON.stringify(editorNote))).toEqual(parsed);
  });

  it("accepts mailto: and http: links and stores the normalised address", () => {
    const parsed = parseNote(doc(para(text("mail", [link("mailto:desk@copperpine.test")]), text(" site", [link("HTTP://Copperpine.TEST/a b")]))));
    const marks = (parsed.content![0] as { content: { marks: unknown[] }[] }).content.map((t) => t.marks[0]);
    expect(marks).toEqual([link("mailto:desk@copperpine.test"), link("http://copperpine.test/a%20b")]);
  });

  it("allow-lists exactly the node types and marks the editor's schema has", () => {
    const schema = getNoteSchema();
    expect(Object.keys(schema.nodes).sort()).toEqual([...NOTE_NODE_TYPES].sort());
    expect(Object.keys(schema.marks).sort()).toEqual([...NOTE_MARK_TYPES].sort());
  });
});

describe("parseNote refuses what the allow-list doesn't name", () => {
  it("refuses unknown node types by name", () => {
    expect(refusal(doc({ type: "codeBlock", content: [text("rm -rf")] }))).toBe("Notes can't contain 'codeBlock'");
    expect(refusal(doc(para(text("a")), { type: "image", attrs: { src: "https://x.test/a.png" } }))).toBe("Notes can't contain 'image'");
    expect(refusal(doc({ type: "script", text: "alert(1)" }))).toBe("Notes can't contain 'script'");
    expect(refusal(doc({ type: "horizontalRule" }))).toBe("Notes can't contain 'horizontalRule'");
    // A name that isn't a plain identifier is not echoed back.
    expect(refusal(doc({ type: "<img src=x onerror=alert(1)>" }))).toBe("Notes can't contain that kind of content");
  });

  it("refuses unknown marks, unknown attributes and duplicated marks", () => {
    expect(refusal(doc(para(text("x", [{ type: "underline" }]))))).toBe("Notes can't use the 'underline' style");
    expect(refusal(doc(para(text("x", [{ type: "strike" }]))))).toBe("Notes can't use the 'strike' style");
    expect(refusal(doc({ type: "paragraph", attrs: { style: "color:red" }, content: [text("x")] }))).toBe("Notes can't set 'attrs' on 'paragraph'");
    expect(refusal(doc(para({ type: "text", text: "x", onclick: "alert(1)" })))).toBe("Notes can't set 'onclick' on 'text'");
    expect(refusal(doc(para(text("x", [{ type: "bold" }, { type: "bold" }]))))).toBe("A piece of text can't have the same style twice");
  });

  it("refuses heading levels other than 2 and 3", () => {
    for (const level of [1, 4, 6, "2"]) {
      expect(refusal(doc({ type: "heading", attrs: { level }, content: [text("x")] }))).toBe("Headings in a note can only be level 2 or 3");
    }
  });

  it("refuses script and data links in every disguise (OWASP XSS Prevention Cheat Sheet: allow-list URL schemes)", () => {
    for (const href of [
      "javascript:alert(1)",
      "JaVaScRiPt:alert(1)",
      " javascript:alert(1)",
      "java\tscript:alert(1)",
      "javascript&colon;alert(1)",
      "data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==",
      "vbscript:msgbox(1)",
      "/shop/admin",
      "//evil.test/x",
      "https://bench.test@evil.test/", // credentials hide the real host: common practice to refuse
    ]) {
      expect(refusal(doc(para(text("click", [link(href)]))))).toBe("Links must start with http://, https:// or mailto:");
    }
  });
});

describe("parseNote size and emptiness", () => {
  it("refuses a 200 kB note as too long", () => {
    const big = doc(para(text("x".repeat(200_000))));
    expect(refusal(big)).toBe("This note is too long: keep it under 20,000 characters.");
    expect(refusal(JSON.stringify(big))).toBe("This note is too long: keep it under 20,000 characters.");
  });

  it("counts characters, not bytes, for the text limit", () => {
    expect(refusal(doc(para(text("x".repeat(NOTE_LIMITS.maxChars + 1)))))).toMatch(/too long/);
    expect(() => parseNote(doc(para(text("x".repeat(NOTE_LIMITS.maxChars)))))).not.toThrow();
    // 20 000 four-byte characters: within the character limit, over the byte limit.
    expect(refusal(doc(para(text("🔧".repeat(NOTE_LIMITS.maxChars)))))).toBe("This note has too much formatting to save: split it into two notes.");
  });

  it("refuses empty and whitespace-only notes", () => {
    const empty = "Write something before posting.";
    expect(refusal(doc())).toBe(empty);
    expect(refusal({ type: "doc" })).toBe(empty);
    expect(refusal(doc({ type: "paragraph" }))).toBe(empty);
    expect(refusal(doc(para(text("   \n\t "))))).toBe(empty);
    expect(refusal(doc(para({ type: "hardBreak" }, { type: "hardBreak" })))).toBe(empty);
    expect(refusal(null)).toBe(empty);
    expect(refusal("")).toBe(empty);
  });

  it("refuses things that are not a note at all", () => {
    expect(refusal("{not json")).toBe("This note couldn't be read. Reload the page and try again.");
    expect(refusal([])).toBe("A note must be a document (type 'doc')");
    expect(refusal({ type: "paragraph", content: [] })).toBe("A note must be a document (type 'doc')");
    expect(refusal(doc("plain string"))).toBe("Each part of a note needs a type");
  });

  it("refuses nesting deeper than the limit", () => {
    let node: unknown = para(text("deep"));
    for (let i = 0; i < NOTE_LIMITS.maxDepth + 2; i++) node = { type: "blockquote", content: [node] };
    expect(refusal(doc(node))).toMatch(/nested too deeply/);
  });
});

describe("parseNote checks structure against the editor's ProseMirror schema", () => {
  it("refuses a list item or text directly in the document", () => {
    expect(refusal(doc(item(para(text("x")))))).toBe("Notes can't put 'listItem' directly inside 'doc'");
    expect(refusal(doc(text("loose text")))).toBe("Notes can't put 'text' directly inside 'doc'");
  });

  it("refuses a paragraph directly in a list and an empty list", () => {
    expect(refusal(doc({ type: "bulletList", content: [para(text("x"))] }))).toBe("Notes can't put 'paragraph' directly inside 'bulletList'");
    expect(refusal(doc({ type: "orderedList", content: [] }, para(text("x"))))).toBe("'orderedList' in this note is missing what belongs inside it");
  });
});

describe("script typed as text", () => {
  it("is kept as text, and noteText returns it verbatim", () => {
    const typed = '<script>alert("hi")</script> & <img src=x onerror=alert(1)>';
    const parsed = parseNote(doc(para(text(typed))));
    expect(noteText(parsed)).toBe(typed);
  });
});

describe("noteText and noteExcerpt", () => {
  it("turns a note into plain text with list markers and quote marks", () => {
    expect(noteText(parseNote(editorNote))).toBe(
      [
        "Intake",
        "Front brake lever feels spongy\nfluid is dark.",
        "Plan",
        "- Bleed the front line\n- Check pads",
        "1. Flush\n2. Test ride",
        "> It pulls to the bar since the spring.",
        "Parts list: supplier page",
      ].join("\n\n"),
    );
  });

  it("cuts an excerpt at a word and marks the cut", () => {
    const parsed = parseNote(doc(para(text("Replaced the chain and both sprockets, set slack to spec"))));
    expect(noteExcerpt(parsed, 30)).toBe("Replaced the chain and both…");
    expect(Array.from(noteExcerpt(parsed, 30)).length).toBeLessThanOrEqual(30);
    expect(noteExcerpt(parsed, 200)).toBe("Replaced the chain and both sprockets, set slack to spec");
  });
});

describe("noteInputSchema", () => {
  it("gives a route's zod schema the same checks, answered as 422 with the field's message", () => {
    const body = z.object({ note: noteInputSchema });
    expect(body.parse({ note: JSON.stringify(editorNote) }).note.type).toBe("doc");
    const { status, body: error } = toErrorBody(body.safeParse({ note: doc({ type: "codeBlock" }) }).error);
    expect(status).toBe(422);
    expect(error.error.fields).toEqual({ note: ["Notes can't contain 'codeBlock'"] });
  });
});

describe("links in the editor and the link box", () => {
  it("lets the editor make only http(s) and mailto links (OWASP XSS Prevention Cheat Sheet)", () => {
    expect(editorAllowsHref("javascript:alert(1)")).toBe(false);
    expect(editorAllowsHref("data:text/html,x")).toBe(false);
    expect(editorAllowsHref("https://parts.example.test/x")).toBe(true);
    expect(editorAllowsHref("parts.example.test/x")).toBe(true); // linkify adds https:// before linking
    expect(editorAllowsHref("desk@copperpine.test")).toBe(true); // linkify adds mailto:
  });

  it("completes what people type into the link box", () => {
    expect(hrefFromInput("parts.example.test/pads")).toBe("https://parts.example.test/pads");
    expect(hrefFromInput("desk@copperpine.test")).toBe("mailto:desk@copperpine.test");
    expect(hrefFromInput("javascript:alert(1)")).toBeNull();
    expect(hrefFromInput("/relative")).toBeNull();
    expect(safeHref("mailto:")).toBeNull();
  });
});

describe("NoteView renders through the allow-list", () => {
  const render = (note: unknown) => renderToStaticMarkup(createElement(NoteView, { doc: note as NoteDoc }));

  it("maps each node to its element", () => {
    const html = render(parseNote(editorNote));
    expect(html).toContain("<h2");
    expect(html).toContain("<h3");
    expect(html).toMatch(/<strong[^>]*><em>spongy<\/em><\/strong>|<em><strong[^>]*>spongy<\/strong><\/em>/);
    expect(html).toContain("<br/>");
    expect(html).toMatch(/<ul[^>]*><li[^>]*><p>Bleed the front line<\/p><\/li>/);
    expect(html).toMatch(/<ol[^>]*><li/);
    expect(html).toContain("<blockquote");
    expect(html).toContain('href="https://parts.example.test/pads?size=2" target="_blank" rel="noopener noreferrer nofollow ugc"');
  });

  it("escapes script typed as text (OWASP XSS Prevention Cheat Sheet, output encoding)", () => {
    const html = render(parseNote(doc(para(text("<script>alert(1)</script>")))));
    expect(html).toContain("&lt;script&gt;alert(1)&lt;/script&gt;");
    expect(html).not.toContain("<script");
  });

  it("drops bad links and unknown nodes even in a doc that skipped parseNote (OWASP XSS Prevention Cheat Sheet)", () => {
    const forged = doc(
      para(text("click me", [link("javascript:alert(1)")]), text(" data", [link("data:text/html,<script>alert(1)</script>")])),
      { type: "script", text: "alert(1)" },
      { type: "image", attrs: { src: "x", onerror: "alert(1)" } },
      { type: "paragraph", attrs: { onclick: "alert(1)" }, content: [text("<img src=x onerror=alert(1)>")] },
      { type: "heading", attrs: { level: 1 }, content: [text("big")] },
    );
    const html = render(forged);
    expect(html).not.toMatch(/javascript:|data:/i);
    expect(html).not.toContain("<a");
    expect(html).not.toMatch(/<script|<img|\sonclick=|\sonerror="/i);
    expect(html).toContain("click me");
    expect(html).toContain("&lt;img src=x onerror=alert(1)&gt;");
    expect(html).not.toContain("<h1");
    expect(render({ type: "script" })).toBe(render(doc()));
  });
});
