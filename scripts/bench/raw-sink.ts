// The baseline for the clip-upload budget: a plain Node HTTP server that streams each PUT body to disk at
// its offset, with none of the video fake's protocol. Run as its own process (like the fake) so both sides
// get a core of their own. `?start=N` places the chunk; `?null=1` writes to /dev/null instead.
import { createWriteStream } from "node:fs";
import http from "node:http";
import { pipeline } from "node:stream/promises";

const file = process.env.BENCH_SINK_FILE;
if (!file) {
  console.error("raw sink: set BENCH_SINK_FILE to the file the bodies are written to");
  process.exit(1);
}

const server = http.createServer((req, res) => {
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const start = Number(url.searchParams.get("start") ?? "0");
  if (req.method !== "PUT" || !Number.isSafeInteger(start) || start < 0) {
    req.resume();
    res.writeHead(400, { "content-type": "text/plain" }).end("PUT a body with ?start=N (a byte offset).");
    return;
  }
  const toNull = url.searchParams.get("null") === "1";
  const out = createWriteStream(toNull ? "/dev/null" : file, { flags: start === 0 ? "w" : "r+", start });
  pipeline(req, out).then(
    () => res.writeHead(200, { "content-type": "text/plain" }).end("ok"),
    (error: unknown) => res.writeHead(500, { "content-type": "text/plain" }).end(String(error)),
  );
});
server.requestTimeout = 30 * 60 * 1000;
server.listen(0, "127.0.0.1", () => {
  const address = server.address();
  if (address === null || typeof address === "string") throw new Error("raw sink: no TCP address");
  console.log(`raw sink listening on http://127.0.0.1:${address.port}`);
});
process.once("SIGTERM", () => {
  server.close(() => process.exit(0));
  server.closeAllConnections();
});
