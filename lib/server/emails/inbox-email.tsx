import "server-only";
import type { ReactNode } from "react";
import { Body, Container, Head, Heading, Hr, Html, Link, Preview, Section, Text } from "@react-email/components";
import { oneLine } from "@/lib/inbox";
import { renderMail } from "./render";
import { mailColors as c, mailFont } from "./theme";

// The desk inbox by e-mail, for the shop's own staff: one item at once, or the morning digest.
// Amounts are in the item only for staff who may see money (the caller leaves them out otherwise).

export type InboxMailItem = {
  label: string;
  summary: string;
  detail: string | null;
  /** Formatted amount, or null (no amount, or a reader who may not see it). */
  money: string | null;
  /** "J-0042 · 2019 Tessaro Ridgeline 570", or null for an item of no job. */
  job: string | null;
  /** When it happened, in the shop's time. */
  when: string;
  /** The job's page, or the inbox. */
  url: string;
};

const text = { color: c.ink, fontSize: 16, lineHeight: "24px", margin: "0 0 8px" } as const;
const muted = { color: c.inkMuted, fontSize: 14, lineHeight: "20px", margin: "0 0 4px" } as const;
const link = { color: c.oil, textDecoration: "underline" } as const;

function StaffFrame(p: { shopName: string; preview: string; heading: string; why: string; settingsUrl: string; children: ReactNode }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{p.preview}</Preview>
      <Body style={{ backgroundColor: c.paper, color: c.ink, fontFamily: mailFont, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: c.surface, border: `1px solid ${c.line}`, borderRadius: 12, maxWidth: 600, padding: "24px" }}>
          <Text style={{ color: c.oil, fontSize: 14, fontWeight: 700, letterSpacing: 0.4, margin: 0, textTransform: "uppercase" }}>{p.shopName} · desk inbox</Text>
          <Heading as="h1" style={{ color: c.ink, fontSize: 22, lineHeight: "28px", margin: "8px 0 16px" }}>
            {p.heading}
          </Heading>
          {p.children}
          <Hr style={{ borderColor: c.line, margin: "24px 0 12px" }} />
          <Text style={{ color: c.inkMuted, fontSize: 13, lineHeight: "20px", margin: 0 }}>
            {p.why}{" "}
            <Link href={p.settingsUrl} style={link}>
              Choose what comes by e-mail
            </Link>
            .
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

function ItemBlock({ item, withLabel }: { item: InboxMailItem; withLabel: boolean }) {
  return (
    <Section style={{ borderLeft: `4px solid ${c.oil}`, margin: "0 0 16px", paddingLeft: 12 }}>
      {withLabel ? <Text style={{ ...text, fontWeight: 700, margin: "0 0 2px" }}>{item.label}</Text> : null}
      <Text style={text}>
        {item.summary}
        {item.money ? ` · ${item.money}` : ""}
      </Text>
      {item.detail ? <Text style={muted}>{item.detail}</Text> : null}
      <Text style={muted}>
        {item.job ? (
          <>
            <Link href={item.url} style={link}>
              {item.job}
            </Link>
            {" · "}
          </>
        ) : null}
        {item.when}
      </Text>
    </Section>
  );
}

/** One item, sent as it happens to staff who chose "e-mail at once" for its kind. */
export async function renderInboxNowMail(p: { shopName: string; item: InboxMailItem; inboxUrl: string; settingsUrl: string }) {
  const { item } = p;
  const subject = oneLine(`${item.label}: ${item.summary}${item.money ? ` · ${item.money}` : ""}${item.job ? ` (${item.job.split(" · ")[0]})` : ""}`, 300);
  const element = (
    <StaffFrame
      shopName={p.shopName}
      preview={oneLine(item.summary, 140)}
      heading={item.label}
      why={`You get this at once because you chose "E-mail at once" for "${item.label}".`}
      settingsUrl={p.settingsUrl}
    >
      <ItemBlock item={item} withLabel={false} />
      <Text style={text}>
        <Link href={item.job ? item.url : p.inboxUrl} style={link}>
          {item.job ? "Open the job" : "Open the inbox"}
        </Link>
      </Text>
    </StaffFrame>
  );
  return { subject, ...(await renderMail(element)) };
}

/** The morning digest: what came in since the last one, for the kinds this person wants that way. */
export async function renderInboxDigestMail(p: { shopName: string; day: string; items: InboxMailItem[]; more: boolean; inboxUrl: string; settingsUrl: string }) {
  const count = p.items.length;
  const heading = `${count}${p.more ? "+" : ""} new in the inbox`;
  const element = (
    <StaffFrame
      shopName={p.shopName}
      preview={p.items.map((i) => i.label).join(", ")}
      heading={heading}
      why='You get this once a day for the kinds you set to "In the morning e-mail"; items you already read in the inbox are left out.'
      settingsUrl={p.settingsUrl}
    >
      {p.items.map((item, i) => (
        <ItemBlock key={i} item={item} withLabel />
      ))}
      {p.more ? <Text style={muted}>More came in than fit here.</Text> : null}
      <Text style={text}>
        <Link href={p.inboxUrl} style={link}>
          Open the inbox
        </Link>
      </Text>
    </StaffFrame>
  );
  return { subject: oneLine(`${p.shopName}: ${heading} (${p.day})`, 300), ...(await renderMail(element)) };
}
