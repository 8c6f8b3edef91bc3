import "server-only";
import { createElement, type ReactElement } from "react";
import type { MailEntry, MailJob, Recipient } from "@/db/queries/notifications";
import { FREQUENCY_LABEL } from "@/lib/following";
import { describeMachine } from "@/lib/machine";
import { appUrl } from "@/lib/server/config";
import { todayIn } from "@/lib/torque-special";
import { mailThumbToken, unsubscribeToken } from "@/lib/server/signed-token";
import { AlertEmail } from "./alert-email";
import { summarizeEntry } from "./entry-summary";
import type { MailFooter } from "./layout";
import { type MailEntryView, ProgressEmail } from "./progress-email";

// Turns a job, a recipient and what happened into a subject, a template and the RFC 8058
// headers. The words differ for the owner ("your …") and a follower ("the …"); a follower's
// copy never carries an approval's title or any price.

export type Composed = { subject: string; element: ReactElement; headers: Record<string, string> };

const THUMBS_PER_ENTRY = 4;
/** Thumbnail links in a mail keep working this long (mail is read late, and re-read). */
const THUMB_LINK_DAYS = 60;

export function jobLinks(job: MailJob, r: Recipient) {
  const base = appUrl();
  const unsubscribeUrl = `${base}/u/${unsubscribeToken(r.id)}`;
  return { base, jobUrl: `${base}/my/jobs/${job.publicId}`, unsubscribeUrl };
}

/**
 * RFC 8058 §3.1: one HTTPS URI in List-Unsubscribe (ours carries an opaque signed token) and
 * List-Unsubscribe-Post with exactly "List-Unsubscribe=One-Click". APP_URL should be https
 * wherever real mail is sent; local runs use http.
 */
export function unsubscribeHeaders(unsubscribeUrl: string): Record<string, string> {
  return { "List-Unsubscribe": `<${unsubscribeUrl}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" };
}

function footer(job: MailJob, r: Recipient, links: ReturnType<typeof jobLinks>): MailFooter {
  const why = r.role === "owner" ? `You get this because ${job.shop.name} is working on your machine` : `You get this because you follow this job at ${job.shop.name}`;
  return { reason: `${why} (${FREQUENCY_LABEL[r.frequency].toLowerCase()}).`, manageUrl: `${links.jobUrl}#following`, unsubscribeUrl: links.unsubscribeUrl };
}

const machineFor = (job: MailJob, r: Recipient) => (r.role === "owner" ? `your ${describeMachine(job.machine)}` : `the ${describeMachine(job.machine)}`);
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

export function entryViews(entries: MailEntry[], timeZone: string, now: Date): MailEntryView[] {
  const when = new Intl.DateTimeFormat("en-US", { timeZone, weekday: "short", month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  const expires = new Date(now.getTime() + THUMB_LINK_DAYS * 24 * 60 * 60 * 1000);
  return entries.map((e) => {
    const { label, text, note } = summarizeEntry({ kind: e.kind, body: e.body, caption: e.caption, photoCount: e.photoIds.length, usedOn: todayIn(timeZone, e.createdAt) });
    return {
      id: e.id,
      time: when.format(e.createdAt),
      author: e.author,
      label,
      text,
      note: note ?? null,
      thumbs: e.photoIds.slice(0, THUMBS_PER_ENTRY).map((id) => `${appUrl()}/api/mail-thumbs/${mailThumbToken(id, expires)}`),
      morePhotos: Math.max(0, e.photoIds.length - THUMBS_PER_ENTRY),
    };
  });
}

/** The batch of updates ("every") or the day's digest ("daily"). */
export function composeProgress(job: MailJob, r: Recipient, views: MailEntryView[], digest: "every" | "daily"): Composed {
  const links = jobLinks(job, r);
  const machine = describeMachine(job.machine);
  const count = `${views.length} update${views.length === 1 ? "" : "s"}`;
  const subject = digest === "daily" ? `Today at ${job.shop.name}: ${machine} (${count})` : `${machine}: ${count} from ${job.shop.name}`;
  const heading = digest === "daily" ? `Today's updates on ${machineFor(job, r)}` : `New on ${machineFor(job, r)}`;
  const intro = `${job.shop.name} shared ${count === "1 update" ? "an update" : count} on ${machineFor(job, r)}.`;
  const element = createElement(ProgressEmail, { shopName: job.shop.name, heading, intro, entries: views, jobUrl: links.jobUrl, footer: footer(job, r, links) });
  return { subject, element, headers: unsubscribeHeaders(links.unsubscribeUrl) };
}

/** "Ready to collect", approval requests and parts arriving, at once; the follower's approval mail says only that the owner was asked. */
export function composeAlert(job: MailJob, r: Recipient, kind: string, payload: Record<string, unknown> | null, extra: { inviterName?: string | null }): Composed | null {
  const links = jobLinks(job, r);
  const machine = describeMachine(job.machine);
  const shop = job.shop.name;
  const call = job.shop.phone ? ` You can call them on ${job.shop.phone}, or reply to this e-mail.` : " Reply to this e-mail to arrange a time.";
  let subject: string;
  let heading: string;
  let lines: string[];
  let action = { href: links.jobUrl, label: "Open the job" };
  if (kind === "ready") {
    subject = `Ready to collect: ${machine}`;
    heading = `${capital(machineFor(job, r))} is ready to collect`;
    lines = r.role === "owner" ? [`${shop} has finished the work on ${machineFor(job, r)}.${call}`] : [`${shop} has finished the work on ${machineFor(job, r)}.`];
  } else if (kind === "approval_request") {
    if (r.role === "owner") {
      const title = typeof payload?.title === "string" ? payload.title.slice(0, 200) : null;
      const link = typeof payload?.link === "string" && payload.link.startsWith("/") && !payload.link.startsWith("//") ? `${links.base}${payload.link}` : links.jobUrl;
      subject = `${shop} needs your OK: ${machine}`;
      heading = "The shop is asking before going further";
      lines = [`${shop} found something on ${machineFor(job, r)} and needs your answer before doing more work.`, ...(title ? [title] : [])];
      action = { href: link, label: "See what they found" };
    } else {
      subject = `Waiting on the owner's OK: ${machine}`;
      heading = `${capital(machineFor(job, r))} is waiting on the owner`;
      lines = [`${shop} has asked ${job.customerName} to approve added work. The job page shows how it goes on.`];
    }
  } else if (kind === "parts_in") {
    subject = `Parts are in: ${machine}`;
    heading = "The parts have arrived";
    lines = [`Every part ${shop} was waiting for on ${machineFor(job, r)} has arrived, and the work goes on.`];
  } else if (kind === "invitation") {
    const who = extra.inviterName ?? job.customerName;
    subject = `${who} invited you to follow the ${machine} at ${shop}`;
    heading = `Follow the ${machine}`;
    lines = [
      `${who} asked ${shop} to keep you posted on the ${machine}: notes, photos and when it's ready.`,
      `To see the job, sign in with this e-mail address (${r.email}); we'll send you a sign-in link. No password needed.`,
    ];
    action = { href: `${links.base}/sign-in?next=${encodeURIComponent(`/my/jobs/${job.publicId}`)}`, label: "Sign in to follow" };
  } else {
    return null;
  }
  const element = createElement(AlertEmail, { shopName: shop, heading, lines, action, footer: footer(job, r, links) });
  return { subject, element, headers: unsubscribeHeaders(links.unsubscribeUrl) };
}
