import "server-only";
import { Body, Button, Column, Container, Head, Heading, Hr, Html, Img, Preview, Row, Section, Text } from "@react-email/components";
import { render } from "@react-email/render";
import { FINDING_CAUTIONS, LINE_KIND_LABEL, type RequestSnapshot, type SnapshotLine } from "@/lib/approvals";
import { CAUTION_DEFERRAL } from "@/lib/cautions";
import { formatHours, formatMoney, formatQuantity, taxLabel } from "@/lib/money";
import { mailColors, mailFont } from "./theme";

// The approval request e-mail (and its one reminder): the finding, its evidence thumbnails, the
// priced lines and totals, and one button to answer. Thumbnails load from token links (the mail
// client has no session); the button leads to the signed-in answer page.

export type ApprovalMailProps = {
  shopName: string;
  ownerName: string;
  machine: string;
  jobNumber: string;
  snapshot: RequestSnapshot;
  answerUrl: string;
  thumbnails: { url: string; alt: string }[];
  reminder: boolean;
};

// The shared mail palette, plus the caution tint (--signal-soft in app/globals.css).
const C = { ...mailColors, muted: mailColors.inkMuted, signalSoft: "#FBE6C8" };
const font = mailFont;

/** "2 × Front brake pads (part FBP-220)", "1.5 h labour: fit pads", as one line of text. */
export function lineWords(line: SnapshotLine): string {
  if (line.kind === "part") return `${formatQuantity(line.qtyThousandths ?? 0)} × ${line.description}${line.partNumber ? ` (part ${line.partNumber})` : ""}`;
  if (line.kind === "labour") return `${line.description} — ${formatHours(line.hoursTenths ?? 0)} h labour`;
  return `${line.description} (${LINE_KIND_LABEL.fee.toLowerCase()})`;
}

function totalRows(s: RequestSnapshot): [string, string][] {
  const m = (n: number) => formatMoney(n, s.currency);
  const rows: [string, string][] = [["Lines", m(s.totals.subtotalMinor)]];
  if (s.totals.suppliesMinor) rows.push(["Shop supplies", m(s.totals.suppliesMinor)]);
  rows.push([taxLabel(s.pricing.tax), m(s.totals.taxMinor)], ["Estimate for all lines", m(s.totals.totalMinor)]);
  return rows;
}

export function mailSubject(p: Pick<ApprovalMailProps, "shopName" | "snapshot" | "reminder">): string {
  return `${p.reminder ? "Reminder: " : ""}${p.shopName} needs your OK: ${p.snapshot.finding.title}`.slice(0, 300);
}

export function ApprovalRequestEmail(p: ApprovalMailProps) {
  const s = p.snapshot;
  const caution = s.finding.safety === "none" ? null : FINDING_CAUTIONS[s.finding.safety];
  const cell = { padding: "8px 0", borderBottom: `1px solid ${C.line}`, fontSize: "15px", color: C.ink, verticalAlign: "top" } as const;
  return (
    <Html lang="en">
      <Head />
      <Preview>{`${p.shopName} found something on your ${p.machine} and needs your answer.`}</Preview>
      <Body style={{ backgroundColor: C.paper, fontFamily: font, margin: 0, padding: "24px 0" }}>
        <Container style={{ backgroundColor: C.surface, border: `1px solid ${C.line}`, borderRadius: "12px", padding: "24px", maxWidth: "560px" }}>
          <Text style={{ color: C.muted, fontSize: "14px", margin: 0 }}>
            {p.shopName} · {p.jobNumber} · {p.machine}
          </Text>
          <Heading as="h1" style={{ color: C.ink, fontSize: "22px", lineHeight: "1.3", margin: "8px 0 16px" }}>
            {p.reminder ? "Still waiting for your answer: " : ""}
            {s.finding.title}
          </Heading>
          <Text style={{ color: C.ink, fontSize: "16px" }}>Hello {p.ownerName},</Text>
          <Text style={{ color: C.ink, fontSize: "16px", whiteSpace: "pre-line" }}>{s.finding.found}</Text>
          {s.finding.whyItMatters ? <Text style={{ color: C.ink, fontSize: "16px", whiteSpace: "pre-line" }}>Why it matters: {s.finding.whyItMatters}</Text> : null}
          {caution ? (
            <Section style={{ backgroundColor: C.signalSoft, borderLeft: `4px solid ${C.signal}`, padding: "8px 12px", margin: "12px 0" }}>
              <Text style={{ color: C.ink, fontSize: "15px", margin: 0 }}>
                <strong>Safety: </strong>
                {caution} {CAUTION_DEFERRAL}
              </Text>
            </Section>
          ) : null}
          {p.thumbnails.length ? (
            <Section style={{ margin: "12px 0" }}>
              <Row>
                {p.thumbnails.slice(0, 4).map((t) => (
                  <Column key={t.url} style={{ paddingRight: "6px", width: "25%" }}>
                    <Img src={t.url} alt={t.alt} width="120" height="120" style={{ borderRadius: "8px", border: `1px solid ${C.line}`, objectFit: "cover" }} />
                  </Column>
                ))}
              </Row>
            </Section>
          ) : null}
          <Heading as="h2" style={{ color: C.ink, fontSize: "18px", margin: "20px 0 4px" }}>
            What the shop proposes
          </Heading>
          <table role="presentation" width="100%" cellPadding={0} cellSpacing={0} style={{ borderCollapse: "collapse" }}>
            <tbody>
              {s.lines.map((line) => (
                <tr key={line.no}>
                  <td style={cell}>{lineWords(line)}</td>
                  <td style={{ ...cell, textAlign: "right", whiteSpace: "nowrap", paddingLeft: "12px" }}>{formatMoney(line.netMinor, s.currency)}</td>
                </tr>
              ))}
              {totalRows(s).map(([label, value], i, all) => (
                <tr key={label}>
                  <td style={{ ...cell, borderBottom: "none", fontWeight: i === all.length - 1 ? 700 : 400 }}>{label}</td>
                  <td style={{ ...cell, borderBottom: "none", textAlign: "right", fontWeight: i === all.length - 1 ? 700 : 400 }}>{value}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Text style={{ color: C.muted, fontSize: "14px" }}>You can approve or decline each line on its own. Nothing is done until you answer.</Text>
          <Section style={{ textAlign: "center", margin: "20px 0" }}>
            <Button href={p.answerUrl} style={{ backgroundColor: C.oil, color: C.onOil, borderRadius: "8px", padding: "14px 24px", fontSize: "17px", fontWeight: 700 }}>
              Review and answer
            </Button>
          </Section>
          <Hr style={{ borderColor: C.line }} />
          <Text style={{ color: C.muted, fontSize: "13px" }}>
            The button opens the request on Benchside. If you aren&apos;t signed in, ask for a sign-in link with this e-mail address and you&apos;ll come straight back to it.
          </Text>
        </Container>
      </Body>
    </Html>
  );
}

/** The plain-text part, written out rather than scraped from the HTML so it reads well on its own. */
export function approvalRequestText(p: ApprovalMailProps): string {
  const s = p.snapshot;
  const caution = s.finding.safety === "none" ? null : `Safety: ${FINDING_CAUTIONS[s.finding.safety]} ${CAUTION_DEFERRAL}`;
  return [
    `${p.shopName} · ${p.jobNumber} · ${p.machine}`,
    "",
    `${p.reminder ? "Still waiting for your answer: " : ""}${s.finding.title}`,
    "",
    `Hello ${p.ownerName},`,
    "",
    s.finding.found,
    ...(s.finding.whyItMatters ? ["", `Why it matters: ${s.finding.whyItMatters}`] : []),
    ...(caution ? ["", caution] : []),
    ...(p.thumbnails.length ? ["", `${p.thumbnails.length} photo${p.thumbnails.length === 1 ? "" : "s"} with the request (see them on the answer page).`] : []),
    "",
    "What the shop proposes:",
    ...s.lines.map((l) => `- ${lineWords(l)}: ${formatMoney(l.netMinor, s.currency)}`),
    "",
    ...totalRows(s).map(([label, value]) => `${label}: ${value}`),
    "",
    "You can approve or decline each line on its own. Nothing is done until you answer.",
    "",
    `Review and answer: ${p.answerUrl}`,
    "",
    "If you aren't signed in, ask for a sign-in link with this e-mail address and you'll come straight back to the request.",
  ].join("\n");
}

export async function renderApprovalMail(p: ApprovalMailProps): Promise<{ subject: string; html: string; text: string }> {
  return { subject: mailSubject(p), html: await render(<ApprovalRequestEmail {...p} />), text: approvalRequestText(p) };
}
