// The cluster's photo storage: s3rver (an S3-compatible server from npm) on loopback, its files in
// S3_DIR, the bucket S3_BUCKET made at start. Run by scripts/cluster.mjs as a child; SIGTERM stops it.
import fs from "node:fs";
import S3rver from "s3rver";

const port = Number(process.env.S3_PORT);
const directory = process.env.S3_DIR;
const bucket = process.env.S3_BUCKET;
if (!port || !directory || !bucket) throw new Error("S3_PORT, S3_DIR and S3_BUCKET must be set");
fs.mkdirSync(directory, { recursive: true });

// s3rver checks signatures against its one built-in key pair (S3RVER / S3RVER).
const server = new S3rver({ port, address: "127.0.0.1", directory, silent: true, configureBuckets: [{ name: bucket }] });
await server.run();
console.log(`s3rver listening on 127.0.0.1:${port}, bucket ${bucket}, files in ${directory}`);

const stop = () => void server.close().then(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
