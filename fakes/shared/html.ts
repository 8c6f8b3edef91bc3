// The frame of the fakes' human-facing pages. Whatever a page shows may be attacker-shaped text
// (subjects, names, URLs from the caller), so every value goes through escapeHtml.

export function escapeHtml(value: string): string {
  return value.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
}

/** A whole page: `banner` says which fake this is, `main` is already-escaped markup. */
export function htmlPage(page: { title: string; style: string; banner: string; main: string }): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="referrer" content="no-referrer">
<title>${escapeHtml(page.title)}</title>
<style>${page.style}</style>
</head>
<body>
${page.banner}
<main>
${page.main}
</main>
</body>
</html>
`;
}
