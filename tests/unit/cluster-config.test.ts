import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
// @ts-expect-error -- plain ESM without type declarations (scripts run before node_modules exists)
import { clusterPorts, galeraNodeConfig, haproxyConfig } from "../../scripts/cluster/config.mjs";

type Node = { n: number; sql: number; gcomm: number; ist: number; sst: number };
const ports = clusterPorts({}) as { http: number; apps: number[]; db: number; nodes: Node[] };
const paths = { datadir: "/d/mariadb", socket: "/d/mariadb.sock", pidFile: "/d/mariadb.pid", errorLog: "/d/mariadb.err" };

describe("npm run cluster: generated configuration", () => {
  it("gives every service a port of its own", () => {
    const all = [ports.http, ...ports.apps, ports.db, ...ports.nodes.flatMap((n) => [n.sql, n.gcomm, n.ist, n.sst])];
    expect(new Set(all).size).toBe(all.length);
    expect(clusterPorts({ CLUSTER_PORT_BASE: "5000" }).http).toBe(5000);
    expect(() => clusterPorts({ CLUSTER_PORT_BASE: "80" })).toThrow(/≥ 1024/);
  });

  it("each Galera node lists all three, listens on its own addresses and keeps ids one sequence", () => {
    const cnf = galeraNodeConfig({ node: ports.nodes[1], nodes: ports.nodes, paths, user: "mysql" }) as string;
    const line = (key: string) => cnf.split("\n").find((l) => l.startsWith(`${key}=`))?.slice(key.length + 1);
    expect(line("wsrep_cluster_address")).toBe(`gcomm://${ports.nodes.map((n) => `127.0.0.1:${n.gcomm}`).join(",")}`);
    expect(line("port")).toBe(String(ports.nodes[1]!.sql));
    expect(line("wsrep_provider_options")).toBe(`"gmcast.listen_addr=tcp://127.0.0.1:${ports.nodes[1]!.gcomm};ist.recv_addr=127.0.0.1:${ports.nodes[1]!.ist};gcache.size=64M"`);
    expect(line("wsrep_sst_receive_address")).toBe(`127.0.0.1:${ports.nodes[1]!.sst}`);
    expect(line("wsrep_auto_increment_control")).toBe("OFF");
    expect(line("auto_increment_increment")).toBe("1");
    expect(line("binlog_format")).toBe("ROW");
    expect(line("innodb_autoinc_lock_mode")).toBe("2");
    expect(line("datadir")).toBe(paths.datadir);
  });

  it("HAProxy balances the apps round robin without stickiness and sends the database to one node, the others as backups", () => {
    const cfg = haproxyConfig({ ports, pidFile: "/d/haproxy.pid" }) as string;
    const section = (name: string) => cfg.split("\n\n").find((s) => s.startsWith(name))!;
    const apps = section("backend apps");
    expect(apps).toContain("balance roundrobin");
    expect(apps).not.toMatch(/cookie|stick|balance source/);
    expect(apps).toContain(`server a 127.0.0.1:${ports.apps[0]} check`);
    expect(apps).toContain(`server b 127.0.0.1:${ports.apps[1]} check`);
    // Only reads are replayed on another instance; a POST an instance may have taken is not.
    expect(apps).toMatch(/retry-on conn-failure empty-response\n\s*http-request disable-l7-retry unless METH_GET \|\| METH_HEAD/);
    const galera = section("backend galera");
    expect(galera).toContain("mode tcp");
    const servers = galera.split("\n").filter((l) => l.trim().startsWith("server "));
    expect(servers).toHaveLength(3);
    expect(servers.filter((s) => / backup\b/.test(s)).map((s) => s.trim().split(" ")[1])).toEqual(["node2", "node3"]);
    expect(section("frontend database")).toContain(`bind 127.0.0.1:${ports.db}`);
  });
});

// Galera doesn't replicate table locks or named locks: the app must not rely on either.
describe("no lock Galera can't replicate", () => {
  const sources = (dir: string): string[] =>
    fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? sources(path.join(dir, e.name)) : /\.tsx?$/.test(e.name) ? [path.join(dir, e.name)] : []));

  it("no LOCK TABLES or GET_LOCK in the app's code", () => {
    const files = ["app", "db", "lib"].flatMap((d) => sources(path.resolve(d)));
    expect(files.length).toBeGreaterThan(100);
    const offending = files.filter((f) => /\bLOCK\s+TABLES?\b|\bGET_LOCK\s*\(/i.test(fs.readFileSync(f, "utf8")));
    expect(offending).toEqual([]);
  });
});
