// Runs Debian's PostgreSQL for Bendwise: finds (or installs) the server, keeps its data folder
// inside the project, listens on 127.0.0.1 only, on a port of our own, and stops cleanly.
// Used by `npm start` (the demo database) and by `npm test` (a throw-away database).
import { execFileSync, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, writeFileSync, chownSync, rmSync } from "node:fs";
import { createHash } from "node:crypto";
import { tmpdir } from "node:os";
import path from "node:path";
import postgres from "postgres";

export const DEMO_PORT = 54329;
export const DB_USER = "bendwise";

const isRoot = process.getuid?.() === 0;

/** The folder holding Debian's PostgreSQL programs, newest version first; installs it when missing. */
export function findPostgresBin(): string {
  const found = listPostgresBins();
  if (found) return found;
  if (!isRoot) {
    throw new Error(
      "PostgreSQL is not installed. Install Debian's server package first:\n" +
        "  sudo apt-get update && sudo apt-get install -y postgresql\n" +
        "or set DATABASE_URL to a PostgreSQL database of your own.",
    );
  }
  console.log("PostgreSQL is missing; installing Debian's postgresql package (apt-get)…");
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "-qq", "postgresql"], {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
  const installed = listPostgresBins();
  if (!installed) throw new Error("apt-get installed postgresql, but no initdb was found under /usr/lib/postgresql.");
  return installed;
}

function listPostgresBins(): string | undefined {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root)
    .filter((v) => existsSync(path.join(root, v, "bin", "initdb")) && existsSync(path.join(root, v, "bin", "pg_ctl")))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(root, versions[0], "bin") : undefined;
}

/** initdb and postgres refuse to run as root: as root we run them as the `postgres` user. */
function runPg(bin: string, program: string, args: string[], opts: { quiet?: boolean } = {}) {
  const cmd = isRoot ? "runuser" : path.join(bin, program);
  const fullArgs = isRoot ? ["-u", "postgres", "--", path.join(bin, program), ...args] : args;
  const result = spawnSync(cmd, fullArgs, { encoding: "utf8", cwd: "/" });
  if (result.status !== 0 && !opts.quiet) {
    throw new Error(`${program} ${args.join(" ")} failed:\n${result.stdout}\n${result.stderr}`);
  }
  return result;
}

/**
 * Where the data folder lives. Inside the project when the `postgres` user can write there;
 * otherwise (a checkout in a closed home folder) a per-checkout folder under /var/tmp.
 */
export function dataFolderFor(projectDir: string): string {
  const inside = path.join(projectDir, ".data", "postgres");
  if (!isRoot) return inside;
  mkdirSync(inside, { recursive: true });
  chownSync(inside, postgresUid(), postgresGid());
  const probe = spawnSync("runuser", ["-u", "postgres", "--", "test", "-w", inside]);
  if (probe.status === 0) return inside;
  const hash = createHash("sha256").update(projectDir).digest("hex").slice(0, 12);
  const outside = path.join("/var/tmp", `bendwise-postgres-${hash}`);
  console.log(`The postgres user cannot write inside ${projectDir}; the demo database lives in ${outside}.`);
  return outside;
}

function postgresUid(): number {
  return Number(execFileSync("id", ["-u", "postgres"], { encoding: "utf8" }).trim());
}
function postgresGid(): number {
  return Number(execFileSync("id", ["-g", "postgres"], { encoding: "utf8" }).trim());
}

export interface RunningPostgres {
  port: number;
  dataDir: string;
  /** URL of the maintenance database, for creating others. */
  adminUrl: string;
  urlFor(database: string): string;
  /** True when this process started the server (and so should stop it). */
  startedHere: boolean;
  stop(): void;
}

/** Creates the cluster when needed and starts it on 127.0.0.1:port (no-op when already running). */
export function startPostgres(dataDir: string, port: number): RunningPostgres {
  const bin = findPostgresBin();
  mkdirSync(dataDir, { recursive: true });
  if (isRoot) chownSync(dataDir, postgresUid(), postgresGid());
  if (!existsSync(path.join(dataDir, "PG_VERSION"))) {
    // trust on loopback only: the server never listens elsewhere (listen_addresses below).
    runPg(bin, "initdb", ["-D", dataDir, "-A", "trust", "-U", DB_USER, "-E", "UTF8", "--no-locale"]);
    writeFileSync(
      path.join(dataDir, "postgresql.auto.conf"),
      ["listen_addresses = '127.0.0.1'", `port = ${port}`, `unix_socket_directories = '${dataDir}'`, "fsync = on", ""].join("\n"),
    );
    if (isRoot) chownSync(path.join(dataDir, "postgresql.auto.conf"), postgresUid(), postgresGid());
  }
  const status = runPg(bin, "pg_ctl", ["-D", dataDir, "status"], { quiet: true });
  let startedHere = false;
  if (status.status !== 0) {
    runPg(bin, "pg_ctl", [
      "-D", dataDir,
      "-o", `-h 127.0.0.1 -p ${port} -k ${dataDir}`,
      "-l", path.join(dataDir, "server.log"),
      "-w", "-t", "60", "start",
    ]);
    startedHere = true;
  }
  const urlFor = (database: string) => `postgres://${DB_USER}@127.0.0.1:${port}/${database}`;
  return {
    port,
    dataDir,
    adminUrl: urlFor("postgres"),
    urlFor,
    startedHere,
    stop: () => stopPostgres(dataDir),
  };
}

export function stopPostgres(dataDir: string) {
  if (!existsSync(path.join(dataDir, "PG_VERSION"))) return;
  const bin = findPostgresBin();
  runPg(bin, "pg_ctl", ["-D", dataDir, "-m", "fast", "-w", "stop"], { quiet: true });
}

/** Creates a database when it does not exist yet (optionally as a copy of a template). */
export async function ensureDatabase(adminUrl: string, name: string, template?: string) {
  const admin = postgres(adminUrl, { max: 1, onnotice: () => {} });
  try {
    const rows = await admin`select 1 from pg_database where datname = ${name}`;
    if (rows.length === 0) {
      const from = template ? ` template "${template}"` : "";
      await admin.unsafe(`create database "${name}"${from}`);
    }
  } finally {
    await admin.end();
  }
}

/** A fresh cluster in a temporary folder, for one test run; removed again on stop. */
export function startThrowAwayPostgres(port: number): RunningPostgres {
  const base = isRoot ? "/var/tmp" : tmpdir();
  const dataDir = path.join(base, `bendwise-test-pg-${process.pid}-${Date.now()}`);
  const running = startPostgres(dataDir, port);
  return {
    ...running,
    stop() {
      stopPostgres(dataDir);
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

// `tsx drizzle/scripts/postgres.ts stop` stops the demo database.
if (import.meta.url === `file://${process.argv[1]}` && process.argv[2] === "stop") {
  stopPostgres(dataFolderFor(process.cwd()));
  console.log("Demo PostgreSQL stopped.");
}
