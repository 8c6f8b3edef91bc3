import { describe, expect, it } from "vitest";
import { parseNote } from "@/lib/rich-text/note";
import { noteText, plainTextDoc } from "@/lib/rich-text/note-text";

// What is typed into the note box before the editor's code has arrived becomes the editor's
// content (components/rich-text/lazy-note-editor.tsx): it must be a note the server accepts.

describe("plainTextDoc", () => {
  it("makes a paragraph a line, an empty line an empty paragraph", () => {
    expect(plainTextDoc("Fan relay clicks\n\nbut the fan stays off")).toEqual({
      type: "doc",
      content: [
        { type: "paragraph", content: [{ type: "text", text: "Fan relay clicks" }] },
        { type: "paragraph" },
        { type: "paragraph", content: [{ type: "text", text: "but the fan stays off" }] },
      ],
    });
    expect(plainTextDoc("a\r\nb").content).toHaveLength(2);
  });

  it("is a note the server takes, reading back as the same words", () => {
    const doc = parseNote(plainTextDoc("Chain slack 35 mm\nAdjusted to 25 mm"));
    expect(noteText(doc)).toBe("Chain slack 35 mm\n\nAdjusted to 25 mm");
  });
});
