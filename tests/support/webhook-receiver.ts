import http from "node:http";

/**
 * An app webhook route, in-process, for a fake to deliver to: the raw body and the headers go to
 * the real handler; its answer is 200 with the result as JSON, or its error's status. `answers`
 * lists the statuses given, in order.
 */
export async function startWebhookReceiver(pathname: string, handle: (rawBody: string, headers: Headers) => Promise<unknown>) {
  const answers: number[] = [];
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const headers = new Headers(Object.entries(req.headers).map(([name, value]) => [name, String(value)] as [string, string]));
      handle(Buffer.concat(chunks).toString("utf8"), headers).then(
        (result) => (answers.push(200), res.writeHead(200, { "content-type": "application/json" }).end(JSON.stringify(result))),
        (error: { status?: number }) => (answers.push(error.status ?? 500), res.writeHead(error.status ?? 500).end()),
      );
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  return { url: `http://127.0.0.1:${(server.address() as { port: number }).port}${pathname}`, answers, close: () => new Promise<void>((r) => server.close(() => r())) };
}
