// Human-facing mailbox pages. Every message field is attacker-shaped text, so everything is escaped.
import { escapeHtml, htmlPage } from "../shared/html";
import type { MailMessage } from "./types";

/** Blocks scripts everywhere, including the srcdoc iframe, which inherits this policy. */
export const PAGE_CSP =
  "default-src 'none'; style-src 'unsafe-inline'; img-src http: https: data:; frame-src 'self'; base-uri 'none'; form-action 'self'";

const STYLE = `
  body { font: 15px/1.5 system-ui, sans-serif; margin: 0; color: #1f2328; background: #f6f7f9; }
  header { background: #243447; color: #fff; padding: 12px 24px; }
  header a { color: #fff; }
  main { padding: 16px 24px; max-width: 1100px; }
  table { border-collapse: collapse; width: 100%; background: #fff; }
  th, td { text-align: left; padding: 6px 10px; border-bottom: 1px solid #dde1e6; vertical-align: top; }
  th { background: #eef1f4; font-weight: 600; }
  .muted { color: #5c6670; }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: 4px 16px; background: #fff; padding: 12px; }
  dt { font-weight: 600; }
  dd { margin: 0; word-break: break-all; }
  pre { background: #fff; padding: 12px; white-space: pre-wrap; word-break: break-word; border: 1px solid #dde1e6; }
  iframe { width: 100%; height: 600px; border: 1px solid #dde1e6; background: #fff; }
  section { margin-top: 20px; }
  h2 { font-size: 16px; margin-bottom: 6px; }
  code { font-size: 13px; }
`;

const BANNER = '<header><strong><a href="/">Benchside mail fake</a></strong> <span>— e-mail the app sent locally; nothing leaves this machine</span></header>';

const layout = (title: string, main: string): string => htmlPage({ title, style: STYLE, banner: BANNER, main });

const list = (values: string[]): string => (values.length ? values.map(escapeHtml).join(", ") : '<span class="muted">—</span>');

const pathId = (id: string): string => encodeURIComponent(id);

export function renderIndex(messages: MailMessage[]): string {
  const rows = messages
    .map(
      (m) => `<tr>
  <td><time datetime="${escapeHtml(m.created_at)}">${escapeHtml(m.created_at.replace("T", " ").replace(/\.\d+Z$/, "Z"))}</time></td>
  <td>${list(m.to)}</td>
  <td><a href="/m/${pathId(m.id)}">${escapeHtml(m.subject || "(no subject)")}</a></td>
</tr>`,
    )
    .join("\n");
  const body = messages.length
    ? `<table>
<thead><tr><th>Time (UTC)</th><th>To</th><th>Subject</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`
    : `<p class="muted">No messages yet. Mail the app sends to this fake shows up here.</p>`;
  return layout("Benchside mail fake", `<h1>Mailbox <span class="muted">(${messages.length})</span></h1>\n${body}`);
}

/** Reply as the recipient: the reply goes to the message's Reply-To and reaches the app as an `email.received` webhook. */
function replyForm(m: MailMessage, replied: string | null): string {
  const done = replied ? `<p role="status">Reply sent (inbound e-mail <code>${escapeHtml(replied)}</code>). <a href="/_fake/inbound">Inbound mail and webhooks</a></p>` : "";
  return `<section><h2>Reply as ${escapeHtml(m.to[0] ?? "the recipient")}</h2>${done}
<form method="post" action="/m/${pathId(m.id)}/reply">
  <label for="reply-text">Reply text (the original is quoted below it, as a mail program would)</label><br>
  <textarea id="reply-text" name="text" rows="5" cols="80" required></textarea><br>
  <button type="submit">Send reply</button>
</form></section>`;
}

export function renderMessage(m: MailMessage, replied: string | null = null): string {
  const headerRows = Object.entries(m.headers)
    .map(([name, value]) => `<tr><th><code>${escapeHtml(name)}</code></th><td><code>${escapeHtml(value)}</code></td></tr>`)
    .join("\n");
  const links = m.links
    // links only ever holds http(s) URLs, so no javascript: URL can reach this href.
    .map((url) => `<li><a href="${escapeHtml(url)}" target="_blank" rel="noopener noreferrer">${escapeHtml(url)}</a></li>`)
    .join("\n");
  const tags = m.tags.map((tag) => `${tag.name}=${tag.value}`);
  const attachments = m.attachments.map((a) => `${a.filename ?? "(unnamed)"}${a.size === null ? "" : ` (${a.size} bytes)`}`);
  const body = `<h1>${escapeHtml(m.subject || "(no subject)")}</h1>
<dl>
  <dt>From</dt><dd>${escapeHtml(m.from)}</dd>
  <dt>To</dt><dd>${list(m.to)}</dd>
  <dt>Cc</dt><dd>${list(m.cc)}</dd>
  <dt>Bcc</dt><dd>${list(m.bcc)}</dd>
  <dt>Reply-To</dt><dd>${list(m.reply_to)}</dd>
  <dt>Date</dt><dd>${escapeHtml(m.created_at)}</dd>
  <dt>Id</dt><dd><code>${escapeHtml(m.id)}</code> · <a href="/_fake/messages/${pathId(m.id)}">JSON</a></dd>
  <dt>Tags</dt><dd>${list(tags)}</dd>
  <dt>Attachments</dt><dd>${list(attachments)}</dd>
</dl>
${replyForm(m, replied)}
<section><h2>Headers</h2>
${headerRows ? `<table>${headerRows}</table>` : '<p class="muted">No custom headers.</p>'}
</section>
<section><h2>Links</h2>
${links ? `<ul>\n${links}\n</ul>` : '<p class="muted">No links.</p>'}
</section>
<section><h2>Text part</h2>
${m.text === null ? '<p class="muted">No text part.</p>' : `<pre>${escapeHtml(m.text)}</pre>`}
</section>
<section><h2>HTML part</h2>
${
  m.html === null
    ? '<p class="muted">No HTML part.</p>'
    : // An empty sandbox attribute disables scripts, forms and same-origin access for the message document.
      `<iframe sandbox title="HTML part" srcdoc="${escapeHtml(m.html)}"></iframe>`
}
</section>`;
  return layout(`${m.subject} — Benchside mail fake`, body);
}

export function renderNotFound(id: string): string {
  return layout("Not found — Benchside mail fake", `<h1>No message ${escapeHtml(id)}</h1><p><a href="/">Back to the mailbox</a></p>`);
}
