// The tester's page: every text, newest first, and beside each one the app sent a form to reply as the
// owner (from the owner's number to the number that texted them). Every value is escaped.
import { escapeHtml, htmlPage } from "../shared/html";
import type { StoredMessage } from "./types";

export const PAGE_CSP = "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'";

const STYLE = `
  body { font: 15px/1.5 system-ui, sans-serif; margin: 0; color: #1f2328; background: #f6f7f9; }
  header { background: #2d3b2f; color: #fff; padding: 12px 24px; }
  header a { color: #fff; }
  main { padding: 16px 24px; max-width: 900px; }
  article { background: #fff; border: 1px solid #dde1e6; border-radius: 6px; padding: 10px 14px; margin-bottom: 12px; }
  article.inbound { border-left: 4px solid #2f6f3e; }
  .meta { color: #5c6670; font-size: 13px; }
  pre { white-space: pre-wrap; word-break: break-word; margin: 6px 0; font: inherit; }
  form { display: flex; gap: 8px; margin-top: 6px; }
  input[type=text] { flex: 1; padding: 8px; min-height: 28px; }
  button { padding: 8px 14px; min-height: 44px; }
`;

const BANNER = '<header><strong><a href="/">Benchside SMS fake</a></strong> <span>— texts the app sent locally; nothing leaves this machine</span></header>';

function card(m: StoredMessage): string {
  const inbound = m.direction === "inbound";
  const meta = `${inbound ? "Reply" : "Text"} from ${escapeHtml(m.from)} to ${escapeHtml(m.to)} · ${escapeHtml(m.date_created)} · <strong>${escapeHtml(m.status)}</strong>${m.error_code ? ` (error ${m.error_code})` : ""}`;
  // Replying as the owner: from the number the text went to, to the number it came from.
  const reply = inbound
    ? ""
    : `<form method="post" action="/reply">
  <input type="hidden" name="from" value="${escapeHtml(m.to)}"><input type="hidden" name="to" value="${escapeHtml(m.from)}">
  <label for="r-${escapeHtml(m.sid)}" class="meta">Reply as ${escapeHtml(m.to)}</label>
  <input type="text" id="r-${escapeHtml(m.sid)}" name="body" required maxlength="1600" placeholder="Reply as the owner (STOP, HELP, a question…)">
  <button type="submit">Send reply</button>
</form>`;
  return `<article class="${inbound ? "inbound" : "outbound"}" data-sid="${escapeHtml(m.sid)}" data-to="${escapeHtml(m.to)}">
<div class="meta">${meta}</div>
<pre>${escapeHtml(m.body)}</pre>
${reply}
</article>`;
}

export function renderIndex(messages: StoredMessage[]): string {
  const main = messages.length
    ? messages.map(card).join("\n")
    : '<p class="meta">No texts yet. Texts the app sends to this fake show up here.</p>';
  return htmlPage({ title: "Benchside SMS fake", style: STYLE, banner: BANNER, main: `<h1>Texts <span class="meta">(${messages.length})</span></h1>\n${main}` });
}
