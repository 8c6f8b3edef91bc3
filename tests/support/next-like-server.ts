import http from "node:http";
import { toErrorBody } from "../../lib/error-body";

// A loopback server that hands each request to a handler the way Next's Node server hands one to
// a route handler: a web Request whose body is the IncomingMessage itself, duplex "half"
// (next/dist/server/web/spec-extension/adapters/next-request.js, fromNodeNextRequest), and a
// thrown error answered with the error body and status as lib/route.ts does. Each request's
// record counts the bytes the handler actually pulled off the socket.

export type RequestRecord = { consumed: number; status: number };

export type NextLikeServer = { url: string; records: RequestRecord[]; close(): Promise<void> };

export async function startNextLikeServer(handle: (req: Request) => Promise<unknown>, opts: { closeOnRefusal?: boolean } = {}): Promise<NextLikeServer> {
  const records: RequestRecord[] = [];
  const server = http.createServer((req, res) => {
    const record: RequestRecord = { consumed: 0, status: 0 };
    records.push(record);
    async function* counted() {
      for await (const chunk of req as AsyncIterable<Buffer>) {
        record.consumed += chunk.length;
        yield chunk;
      }
    }
    const headers = new Headers();
    for (const [name, value] of Object.entries(req.headers)) if (typeof value === "string") headers.set(name, value);
    const hasBody = req.method !== "GET" && req.method !== "HEAD";
    const request = new Request(`http://127.0.0.1${req.url ?? "/"}`, { method: req.method, headers, body: hasBody ? (counted() as unknown as BodyInit) : null, duplex: "half" } as RequestInit);
    void handle(request).then(
      (body) => answer(200, body ?? { ok: true }),
      (error: unknown) => {
        const { status, body } = toErrorBody(error);
        answer(status, body, opts.closeOnRefusal && status === 413 ? { connection: "close" } : {});
      },
    );
    function answer(status: number, body: unknown, extra: Record<string, string> = {}) {
      record.status = status;
      if (res.destroyed) return;
      res.writeHead(status, { "content-type": "application/json", ...extra }).end(JSON.stringify(body));
    }
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as { port: number };
  return {
    url: `http://127.0.0.1:${port}`,
    records,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

export type SendResult = { status: number | null; body: string; sent: number; error: string | null; ms: number };

/**
 * Sends `total` bytes of `chunk` repeated, as one POST with no Content-Length (chunked) unless
 * `headers` give one, honouring back-pressure; stops sending once the answer has come. Resolves
 * when the exchange is over, with what was answered and how much was sent.
 */
export function sendStreamed(url: string, { total, chunk = Buffer.alloc(64 * 1024, 7), headers = {}, prefix, suffix }: { total: number; chunk?: Buffer; headers?: Record<string, string>; prefix?: Buffer; suffix?: Buffer }): Promise<SendResult> {
  const started = Date.now();
  return new Promise((resolve) => {
    const result: SendResult = { status: null, body: "", sent: 0, error: null, ms: 0 };
    let answered = false;
    let settled = false;
    const settle = () => {
      if (settled) return;
      settled = true;
      result.ms = Date.now() - started;
      resolve(result);
    };
    const req = http.request(url, { method: "POST", headers: { ...(headers["content-length"] ? {} : { "transfer-encoding": "chunked" }), ...headers } });
    req.on("response", (res) => {
      answered = true;
      result.status = res.statusCode ?? null;
      res.setEncoding("utf8");
      res.on("data", (d: string) => (result.body += d));
      res.on("end", settle);
      res.on("error", settle);
    });
    req.on("error", (error: NodeJS.ErrnoException) => {
      result.error = error.code ?? error.message;
      // The server may close right after answering: the answer, if it came, still counts.
      setTimeout(settle, answered ? 200 : 0);
    });
    req.on("close", () => setTimeout(settle, 200));
    void (async () => {
      const write = (buf: Buffer) =>
        new Promise<void>((done) => {
          result.sent += buf.length;
          if (req.write(buf)) return done();
          const onDrain = () => (req.off("close", onDrain), done());
          req.once("drain", onDrain);
          req.once("close", onDrain);
        });
      if (prefix) await write(prefix);
      let left = total;
      while (left > 0 && !answered && !req.destroyed) {
        const piece = left >= chunk.length ? chunk : chunk.subarray(0, left);
        await write(piece);
        left -= piece.length;
      }
      if (suffix && !answered && !req.destroyed) await write(suffix);
      if (!req.destroyed) req.end();
    })();
  });
}
