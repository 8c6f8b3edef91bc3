import { createElement as h } from "react";
import { describe, expect, it } from "vitest";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";
import { MAIL_NOTE_LIMITS, capNote } from "@/lib/server/emails/note-cap";
import { NoteMail } from "@/lib/server/emails/note-mail";
import { type MailEntryView, ProgressEmail } from "@/lib/server/emails/progress-email";
import { listMarker, renderMail } from "@/lib/server/emails/render";
import { type NoteDoc, noteText, parseNote } from "@/lib/rich-text/note";

// A job note in progress e-mails: structure in the HTML and in the text part, nothing from the
// note ever becomes markup, and long notes are cut to MAIL_NOTE_LIMITS.

const doc = (...content: unknown[]) => ({ type: "doc", content }) as NoteDoc;
const text = (value: string, marks?: unknown[]) => ({ type: "text", text: value, ...(marks ? { marks } : {}) });
const para = (...content: unknown[]) => ({ type: "paragraph", content });
const item = (...content: unknown[]) => ({ type: "listItem", content });
const bullets = (...items: unknown[]) => ({ type: "bulletList", content: items });
const numbered = (attrs: Record<string, unknown> | undefined, ...items: unknown[]) => ({ type: "orderedList", ...(attrs ? { attrs } : {}), content: items });
const heading = (level: 2 | 3, value: string) => ({ type: "heading", attrs: { level }, content: [text(value)] });
const link = (href: string) => ({ type: "link", attrs: { href } });

// Checked with parseNote first, so the mail is tested on what the writer really stores.
const workNote = parseNote(
  doc(
    heading(2, "Front brakes"),
    para(text("Lever feels "), text("spongy", [{ type: "bold" }]), text(" and the fluid is "), text("dark", [{ type: "italic" }]), { type: "hardBreak" }, text("pads at 1 mm.")),
    heading(3, "Done today"),
    bullets(item(para(text("Bled the front line"))), item(para(text("Checked the rear pads")), bullets(item(para(text("left 3 mm"))), item(para(text("right 3 mm")))))),
    heading(3, "Next"),
    numbered({ start: 1, type: null }, item(para(text("Fit new pads"))), item(para(text("Test ride")), para(text("around the yard"))), item(para(text("Call the owner")))),
    { type: "blockquote", content: [para(text("Squeal only when cold."))] },
  ),
);

const noteHtml = async (d: NoteDoc) => renderMail(h(NoteMail, { doc: d }));

describe("a note in an e-mail", () => {
  it("keeps headings, bullet and numbered lists (nested), bold, italic, breaks and paragraphs in the HTML", async () => {
    const { html } = await noteHtml(workNote);
    expect(html).toMatch(/<h2 [^>]*>Front brakes<\/h2>/);
    expect(html).toMatch(/<h3 [^>]*>Done today<\/h3>/);
    expect(html).toMatch(/<ul [^>]*><li [^>]*><p [^>]*>Bled the front line<\/p><\/li>/);
    // The nested list sits inside its item.
    expect(html).toMatch(/Checked the rear pads<\/p><ul [^>]*><li [^>]*><p [^>]*>left 3 mm<\/p><\/li>/);
    expect(html).toMatch(/<ol [^>]*><li [^>]*><p [^>]*>Fit new pads<\/p><\/li>/);
    expect(html).toContain("<strong>spongy</strong>");
    expect(html).toContain("<em>dark</em>");
    expect(html).toContain("<br/>pads at 1 mm.");
    expect(html).toMatch(/<blockquote [^>]*><p [^>]*>Squeal only when cold.<\/p><\/blockquote>/);
  });

  it("styles inline only: no style sheet, no class, no external CSS", async () => {
    const { html } = await noteHtml(workNote);
    expect(html).not.toMatch(/<style|<link|class=/);
    expect(html).toMatch(/<h2 data-note="heading" style="color:#1E1B17;[^"]*font-weight:700/);
  });

  it("gives the text part the same structure: own-line headings, '- ' and '1. ' markers, blank lines between blocks", async () => {
    const { text: plain } = await noteHtml(workNote);
    expect(plain).toBe(
      [
        "Front brakes",
        "",
        "Lever feels spongy and the fluid is dark",
        "pads at 1 mm.",
        "",
        "Done today",
        "",
        "- Bled the front line",
        "- Checked the rear pads",
        "  - left 3 mm",
        "  - right 3 mm",
        "",
        "Next",
        "",
        "1. Fit new pads",
        "2. Test ride",
        "   around the yard",
        "3. Call the owner",
        "",
        "> Squeal only when cold.",
      ].join("\n"),
    );
    // The same layout as the note's plain text used for search and summaries.
    expect(plain).toBe(noteText(workNote));
  });

  it("numbers an ordered list from its start, in its style", async () => {
    const { html, text: plain } = await noteHtml(parseNote(doc(numbered({ start: 4, type: "a" }, item(para(text("four"))), item(para(text("five")))))));
    expect(html).toMatch(/<ol data-note="list" start="4" type="a"/);
    expect(plain).toBe("d. four\ne. five");
    // HTML's <ol type>: letters run a..z, aa..; Roman numerals by the usual subtractive rule.
    expect([listMarker(1, "a"), listMarker(26, "a"), listMarker(27, "a"), listMarker(4, "i"), listMarker(1994, "I"), listMarker(12, undefined)]).toEqual(["a", "z", "aa", "iv", "MCMXCIV", "12"]);
  });

  it("escapes everything typed into a note: no <script>, no new element or attribute", async () => {
    const typed = '<script>alert("x")</script> & <img src=x onerror=alert(1)>';
    const d = parseNote(doc(heading(2, "<b>hi</b>"), bullets(item(para(text(typed)))), para(text('"><svg onload=alert(1)>', [{ type: "bold" }]))));
    const { html, text: plain } = await noteHtml(d);
    // Every element and attribute is the renderer's own; the note's words are only text between them.
    const tags = [...html.matchAll(/<([a-z][a-z0-9]*)([^>]*)>/gi)];
    expect([...new Set(tags.map((t) => t[1]))].sort()).toEqual(["div", "h2", "li", "p", "strong", "ul"]);
    expect([...new Set(tags.flatMap((t) => [...t[2]!.matchAll(/\s([a-z-]+)=/gi)].map((a) => a[1])))].sort()).toEqual(["data-note", "style"]);
    expect(html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &lt;img src=x onerror=alert(1)&gt;");
    expect(html).toContain("<strong>&quot;&gt;&lt;svg onload=alert(1)&gt;</strong>");
    // The text part is text/plain: the words come through as typed.
    expect(plain).toContain(`- ${typed}`);
  });

  it("links only http(s) and mailto, with the href escaped; anything else stays plain text", async () => {
    // A stored row that never passed parseNote: the renderer checks every href again.
    const d = doc(
      para(text("parts", [link("https://parts.example.test/pads?size=2&side=front")]), text(" · "), text("desk", [link("mailto:desk@kettle-creek.test")])),
      para(text("bad one", [link("javascript:alert(1)")]), text(" "), text("data", [link("data:text/html,<script>alert(1)</script>")])),
      para(text("quote", [link('https://x.test/"onmouseover="alert(1)')])),
      { type: "script", content: [text("alert(1)")] },
    );
    const { html, text: plain } = await noteHtml(d);
    expect(html).toContain('<a href="https://parts.example.test/pads?size=2&amp;side=front" style="color:#0D5257;text-decoration:underline">parts</a>');
    expect(html).toContain('<a href="mailto:desk@kettle-creek.test"');
    expect(html).not.toMatch(/javascript:|data:text|<script/);
    expect(html).toMatch(/>bad one<!-- --> <!-- -->data<\/p>/);
    expect(html).toContain('href="https://x.test/%22onmouseover=%22alert(1)"');
    expect(html).not.toContain('"onmouseover');
    expect(plain).toContain("parts https://parts.example.test/pads?size=2&side=front");
  });
});

describe("capNote: how much of a long note an e-mail carries", () => {
  it("leaves a note within the limits whole", () => {
    expect(capNote(workNote)).toEqual({ doc: workNote, cut: false });
  });

  it(`keeps the first ${MAIL_NOTE_LIMITS.blocks} lines, whole, and says the rest was left out`, () => {
    const long = doc(...Array.from({ length: 40 }, (_, i) => para(text(`Line ${i + 1}`))));
    const { doc: capped, cut } = capNote(long);
    expect(cut).toBe(true);
    expect(capped.content).toHaveLength(MAIL_NOTE_LIMITS.blocks);
    expect(noteText(capped).split("\n\n").at(-1)).toBe(`Line ${MAIL_NOTE_LIMITS.blocks}`);
  });

  it("counts list items as lines and keeps the list's structure where it stops", () => {
    const d = doc(heading(2, "Steps"), numbered({ start: 7 }, ...Array.from({ length: 6 }, (_, i) => item(para(text(`Step ${i + 7}`))))), para(text("After")));
    const { doc: capped, cut } = capNote(d, { chars: 1000, blocks: 4 });
    expect(cut).toBe(true);
    expect(noteText(capped)).toBe("Steps\n\n7. Step 7\n8. Step 8\n9. Step 9");
  });

  it(`cuts the text at a word once ${MAIL_NOTE_LIMITS.chars} characters are shown, with "…"`, () => {
    const words = Array.from({ length: 600 }, (_, i) => `word${i}`).join(" "); // about 4,800 characters
    const { doc: capped, cut } = capNote(doc(para(text(words, [{ type: "bold" }])), para(text("never shown"))));
    expect(cut).toBe(true);
    const shown = noteText(capped);
    expect(Array.from(shown).length).toBeLessThanOrEqual(MAIL_NOTE_LIMITS.chars + 1);
    expect(shown).toMatch(/word\d+…$/);
    expect(shown).not.toContain("never shown");
    // The bold stays on the part shown.
    expect((capped.content![0] as { content: { marks?: unknown[] }[] }).content[0]!.marks).toEqual([{ type: "bold" }]);
  });

  it("gives an empty note for a body that isn't a note", () => {
    for (const body of [null, "text", 42, { type: "paragraph" }, []]) expect(capNote(body)).toEqual({ doc: { type: "doc", content: [] }, cut: false });
  });
});

describe("the progress e-mail with notes", () => {
  const footer = { reason: "You follow this job.", manageUrl: "https://app.benchside.test/my/jobs/j1#following", unsubscribeUrl: "https://app.benchside.test/u/t" };
  const view = (id: number, body: unknown): MailEntryView => {
    const s = summarizeEntry({ kind: "note", body, caption: null, photoCount: 0 });
    return { id, time: "Tue, Dec 2, 9:00 AM", author: "Ada", label: s.label, text: s.text, note: s.note ?? null, thumbs: [], morePhotos: 0 };
  };

  it("shows each note in its structure, and a link to the rest after a cut one", async () => {
    const long = doc(...Array.from({ length: 30 }, (_, i) => para(text(`Line ${i + 1}`))));
    const { html, text: plain } = await renderMail(
      h(ProgressEmail, { shopName: "Kettle Creek Motors", heading: "New on your machine", intro: "Two updates.", entries: [view(1, workNote), view(2, long)], jobUrl: "https://app.benchside.test/my/jobs/j1", footer }),
    );
    expect(html).toMatch(/<ul [^>]*><li [^>]*><p [^>]*>Bled the front line<\/p>/);
    expect(plain).toContain("Done today\n\n- Bled the front line\n- Checked the rear pads\n  - left 3 mm");
    expect(plain).toContain("1. Fit new pads\n2. Test ride");
    expect(html.match(/Read the rest on the job page/g)).toHaveLength(1);
    expect(html).toMatch(/<a href="https:\/\/app\.benchside\.test\/my\/jobs\/j1"[^>]*>Read the rest on the job page<\/a>/);
    expect(plain).toContain(`Line ${MAIL_NOTE_LIMITS.blocks}\n\nRead the rest on the job page https://app.benchside.test/my/jobs/j1`);
    expect(plain).not.toContain(`Line ${MAIL_NOTE_LIMITS.blocks + 1}`);
  });

  it("a note that can't be read still gets its line, without text", () => {
    expect(summarizeEntry({ kind: "note", body: "not json", caption: null, photoCount: 0 })).toEqual({ label: "Note", text: null });
  });
});
