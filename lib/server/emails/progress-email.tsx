import { Img, Link, Section, Text } from "@react-email/components";
import type { NoteDoc } from "@/lib/rich-text/note-types";
import { MailButton, type MailFooter, MailLayout, paragraph } from "./layout";
import { NoteMail } from "./note-mail";
import { mailColors as c } from "./theme";

export type MailEntryView = {
  id: number;
  time: string;
  author: string | null;
  label: string;
  text: string | null;
  /** A note's blocks (capped, see note-cap.ts): shown in place of `text`; `cut` adds the link to the rest. */
  note: { doc: NoteDoc; cut: boolean } | null;
  thumbs: string[];
  morePhotos: number;
};

/** Several shared entries in one e-mail: the "every update" batch and the daily digest. */
export function ProgressEmail(p: { shopName: string; heading: string; intro: string; entries: MailEntryView[]; jobUrl: string; footer: MailFooter }) {
  return (
    <MailLayout shopName={p.shopName} preview={p.intro} heading={p.heading} footer={p.footer}>
      <Text style={paragraph}>{p.intro}</Text>
      {p.entries.map((e) => (
        <Section key={e.id} style={{ borderTop: `1px solid ${c.line}`, padding: "12px 0" }}>
          <Text style={{ color: c.inkMuted, fontSize: 13, lineHeight: "18px", margin: "0 0 4px" }}>
            {e.time}
            {e.author ? ` · ${e.author}` : ""} · <strong style={{ color: c.ink }}>{e.label}</strong>
          </Text>
          {e.note ? (
            <>
              <NoteMail doc={e.note.doc} />
              {e.note.cut ? (
                <Text style={paragraph}>
                  <Link href={p.jobUrl} style={{ color: c.oil, textDecoration: "underline" }}>
                    Read the rest on the job page
                  </Link>
                </Text>
              ) : null}
            </>
          ) : e.text ? (
            <Text style={{ ...paragraph, whiteSpace: "pre-line" }}>{e.text}</Text>
          ) : null}
          {e.thumbs.length ? (
            // Left out of the text part, where the label already says how many photos there are.
            <Text data-skip-in-text="true" style={{ margin: "4px 0 0" }}>
              {e.thumbs.map((src, i) => (
                <Link key={src} href={p.jobUrl} style={{ color: c.oil, display: "inline-block", marginRight: 8 }}>
                  <Img src={src} width="120" height="120" alt={`Photo ${i + 1}${e.text ? `: ${e.text}` : ""}`} style={{ borderRadius: 6, objectFit: "cover" }} />
                </Link>
              ))}
              {e.morePhotos > 0 ? <span style={{ color: c.inkMuted, fontSize: 13 }}>and {e.morePhotos} more</span> : null}
            </Text>
          ) : null}
        </Section>
      ))}
      <MailButton href={p.jobUrl}>Open the job</MailButton>
    </MailLayout>
  );
}
