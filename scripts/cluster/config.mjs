// Pure pieces of `npm run cluster`: the port layout, each Galera node's option file and HAProxy's
// configuration. No I/O here, so tests/unit/cluster-config.test.ts can read them as text.
import path from "node:path";

/** Every port of the cluster, on 127.0.0.1; CLUSTER_PORT_BASE (default 3400) moves the app side. */
export function clusterPorts(env = process.env) {
  const base = Number(env.CLUSTER_PORT_BASE ?? 3400);
  const galera = Number(env.CLUSTER_GALERA_PORT_BASE ?? 4560);
  if (!Number.isInteger(base) || !Number.isInteger(galera) || base < 1024 || galera < 1024) {
    throw new Error("CLUSTER_PORT_BASE and CLUSTER_GALERA_PORT_BASE must be port numbers ≥ 1024");
  }
  return {
    http: base, // HAProxy, in front of the two app instances: the address people use
    apps: [base + 1, base + 2],
    stats: base + 9, // HAProxy's status page
    db: base + 60, // HAProxy, in front of the Galera nodes: the apps' DATABASE_URL
    nodes: [1, 2, 3].map((n) => ({
      n,
      sql: base + 60 + n,
      gcomm: galera + n, // group communication (replication)
      ist: galera + 10 + n, // incremental state transfer
      sst: galera + 20 + n, // full state transfer (rsync)
    })),
    mail: base + 10,
    video: base + 20,
    payments: base + 30,
    s3: base + 40,
  };
}

/** Where node n keeps its files (the layout of scripts/lib/mariadb.mjs's mariadbPaths, one folder per node). */
export const nodeDir = (clusterDir, n) => path.join(clusterDir, `node${n}`);

/**
 * The option file of one Galera node. Why the less obvious lines:
 * - wsrep_auto_increment_control=OFF with increment 1: ids stay one sequence with step 1, which
 *   the live-update streams rely on (README); HAProxy sends every write to one node at a time, so
 *   no two nodes hand out the same id, and if they ever did the second commit fails certification.
 * - innodb_autoinc_lock_mode=2 and binlog_format=ROW: what Galera's row replication requires.
 * - log_bin_trust_function_creators=1: the migrations create triggers.
 */
export function galeraNodeConfig({ node, nodes, paths, user, clusterName = "benchside", sstMethod = "rsync" }) {
  const addresses = nodes.map((x) => `127.0.0.1:${x.gcomm}`).join(",");
  const provider = [`gmcast.listen_addr=tcp://127.0.0.1:${node.gcomm}`, `ist.recv_addr=127.0.0.1:${node.ist}`, "gcache.size=64M"].join(";");
  const lines = [
    "[mariadbd]",
    `user=${user}`,
    `datadir=${paths.datadir}`,
    `socket=${paths.socket}`,
    `port=${node.sql}`,
    "bind-address=127.0.0.1",
    `pid-file=${paths.pidFile}`,
    `log-error=${paths.errorLog}`,
    "skip-name-resolve",
    "character-set-server=utf8mb4",
    "collation-server=utf8mb4_unicode_ci",
    "default-time-zone=+00:00",
    "innodb-buffer-pool-size=96M",
    "performance_schema=OFF",
    "default_storage_engine=InnoDB",
    "binlog_format=ROW",
    "innodb_autoinc_lock_mode=2",
    "log_bin_trust_function_creators=1",
    "wsrep_on=ON",
    "wsrep_provider=/usr/lib/galera/libgalera_smm.so",
    `wsrep_cluster_name=${clusterName}`,
    `wsrep_cluster_address=gcomm://${addresses}`,
    `wsrep_node_name=node${node.n}`,
    `wsrep_node_address=127.0.0.1:${node.gcomm}`,
    `wsrep_provider_options="${provider}"`,
    `wsrep_sst_method=${sstMethod}`,
    `wsrep_sst_receive_address=127.0.0.1:${node.sst}`,
    "wsrep_auto_increment_control=OFF",
    "auto_increment_increment=1",
    "auto_increment_offset=1",
    "",
  ];
  return lines.join("\n");
}

/**
 * HAProxy in front of the apps (HTTP, round robin, no stickiness) and the Galera nodes (TCP).
 * Writes go to one node at a time (node 1; nodes 2 and 3 are backups taking over when it fails
 * its checks): the usual way to run Galera behind a proxy, since writers on several nodes would
 * fail certification against each other on hot rows (job numbers, status counters) far more
 * often than they wait on a lock, and event ids must stay in commit order.
 */
export function haproxyConfig({ ports, pidFile }) {
  const app = (name, port) => `  server ${name} 127.0.0.1:${port} check inter 1s fall 3 rise 2`;
  const db = (node) =>
    // When node 1 is back, the backups' connections are closed so writes return to one node.
    `  server node${node.n} 127.0.0.1:${node.sql} check inter 1s fall 2 rise 3 on-marked-down shutdown-sessions${node.n === 1 ? " on-marked-up shutdown-backup-sessions" : " backup"}`;
  return [
    "global",
    "  maxconn 4096",
    `  pidfile ${pidFile}`,
    "",
    "defaults",
    "  timeout connect 2s",
    "  timeout client 1h",
    "  timeout server 1h",
    "",
    "frontend web",
    "  mode http",
    `  bind 127.0.0.1:${ports.http}`,
    // The app counts sign-in limits by the address HAProxy saw (TRUSTED_PROXY_HOPS=1).
    "  option forwardfor",
    // Longer than the live-update streams' 15 s heartbeat; idle keep-alive connections end sooner.
    "  timeout client 60s",
    "  timeout http-keep-alive 10s",
    "  default_backend apps",
    "",
    "backend apps",
    "  mode http",
    "  balance roundrobin",
    "  option httpchk GET /api/health",
    "  http-check expect status 200",
    // A request that could not reach an instance (refused connection) goes to the other one, and
    // so does a read that met a connection the dead instance closed without answering; a form
    // or upload an instance may have taken is never sent twice.
    "  retries 2",
    "  retry-on conn-failure empty-response",
    "  http-request disable-l7-retry unless METH_GET || METH_HEAD",
    "  option redispatch 1",
    "  timeout server 60s",
    "  timeout tunnel 1h",
    // Which instance answered: the --test checks use it to prove a request crossed instances.
    "  http-response set-header X-Benchside-Instance %s",
    app("a", ports.apps[0]),
    app("b", ports.apps[1]),
    "",
    "frontend database",
    "  mode tcp",
    `  bind 127.0.0.1:${ports.db}`,
    "  default_backend galera",
    "",
    "backend galera",
    "  mode tcp",
    // A node is up when it answers a new connection with the server's greeting (no user needed).
    "  option tcp-check",
    "  tcp-check connect",
    "  tcp-check expect string MariaDB",
    ...ports.nodes.map(db),
    "",
    "frontend stats",
    "  mode http",
    `  bind 127.0.0.1:${ports.stats}`,
    "  stats enable",
    "  stats uri /",
    "  stats refresh 2s",
    "",
  ].join("\n");
}
