// `npm run db:backup` and `npm run db:restore`: a whole Bendwise database (the app's tables, Drizzle's
// record of migrations, the mail queue) to and from one file, with pg_dump and pg_restore from Debian's
// PostgreSQL (custom format: compressed, and pg_restore can restore it into any database).
//
//   npm run db:backup                          → .data/backups/bendwise-<date>-<time>.dump
//   npm run db:backup -- --file path.dump      → that file
//   npm run db:restore                         → the newest file in .data/backups, over the database
//   npm run db:restore -- path.dump            → that file
//   npm run db:restore -- path.dump --into bendwise_copy   → into another database on the same server
//                                                             (made when missing), leaving the first alone
//
// The database is DATABASE_URL when set, else the demo database of `npm start` (its PostgreSQL is
// started for the backup and stopped again when it was not running). Restoring replaces what the
// target database holds: all of it or nothing (see restoreDatabase). Stop the app first, or it
// reconnects to the restored database on its next query.
// BENDWISE_BACKUP_DIR changes the folder (default .data/backups, git-ignored).
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import postgres from "postgres";
import { DEMO_PORT, dataFolderFor, findPostgresBin, startPostgres } from "./postgres";

export const backupFolder = () => path.resolve(process.env.BENDWISE_BACKUP_DIR ?? path.join(process.cwd(), ".data", "backups"));

function timestamp(date = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${date.getFullYear()}${pad(date.getMonth() + 1)}${pad(date.getDate())}-${pad(date.getHours())}${pad(date.getMinutes())}${pad(date.getSeconds())}`;
}

/** The database to work on, and a function to call when done (stops the demo PostgreSQL when we started it). */
function targetDatabase(): { url: string; done: () => void } {
  if (process.env.DATABASE_URL) return { url: process.env.DATABASE_URL, done: () => {} };
  const pg = startPostgres(dataFolderFor(process.cwd()), Number(process.env.BENDWISE_PG_PORT ?? DEMO_PORT));
  return { url: pg.urlFor("bendwise"), done: () => (pg.startedHere ? pg.stop() : undefined) };
}

function run(program: string, args: string[]) {
  const result = spawnSync(path.join(findPostgresBin(), program), args, { encoding: "utf8" });
  if (result.status !== 0) throw new Error(`${program} failed (exit ${result.status}):\n${result.stderr || result.stdout}`);
  return result;
}

/** Writes the database at `url` to `file` (pg_dump, custom format); answers the file's path. */
export function backupDatabase(url: string, file?: string): string {
  const target = path.resolve(file ?? path.join(backupFolder(), `bendwise-${timestamp()}.dump`));
  mkdirSync(path.dirname(target), { recursive: true });
  run("pg_dump", ["--format=custom", "--no-owner", `--file=${target}`, `--dbname=${url}`]);
  return target;
}

/** The newest .dump in the backup folder. */
export function newestBackup(): string {
  const folder = backupFolder();
  const dumps = existsSync(folder) ? readdirSync(folder).filter((f) => f.endsWith(".dump")).map((f) => path.join(folder, f)) : [];
  if (dumps.length === 0) throw new Error(`There is no backup in ${folder}. Make one with \`npm run db:backup\`, or name the file.`);
  return dumps.sort((a, b) => statSync(b).mtimeMs - statSync(a).mtimeMs)[0];
}

/**
 * Restores `file` over the database at `url` (or into database `into` on the same server). The backup
 * goes first into a new database beside it; only when that has fully worked is the old database
 * dropped (closing its connections: an app using it reconnects) and the new one renamed in its place.
 * A failed restore leaves the old database as it was.
 */
export async function restoreDatabase(url: string, file: string, into?: string): Promise<string> {
  if (!existsSync(file)) throw new Error(`There is no backup file at ${file}.`);
  const name = into ?? decodeURIComponent(new URL(url).pathname.slice(1));
  if (!/^[A-Za-z_][A-Za-z0-9_]{0,50}$/.test(name)) throw new Error(`"${name}" is not a database name this script restores into (letters, digits, _).`);
  const at = (database: string) => {
    const u = new URL(url);
    u.pathname = `/${database}`;
    return u.toString();
  };
  const staging = `${name}_restoring`;
  const admin = postgres(at("postgres"), { max: 1, onnotice: () => {} });
  try {
    await admin.unsafe(`drop database if exists "${staging}" with (force)`);
    await admin.unsafe(`create database "${staging}"`);
    try {
      run("pg_restore", ["--no-owner", "--single-transaction", "--exit-on-error", `--dbname=${at(staging)}`, file]);
    } catch (error) {
      await admin.unsafe(`drop database if exists "${staging}" with (force)`);
      throw error;
    }
    await admin.unsafe(`drop database if exists "${name}" with (force)`);
    await admin.unsafe(`alter database "${staging}" rename to "${name}"`);
  } finally {
    await admin.end();
  }
  return at(name);
}

function option(args: string[], name: string): string | undefined {
  const at = args.indexOf(name);
  return at >= 0 ? args[at + 1] : undefined;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const [command, ...args] = process.argv.slice(2);
  const { url, done } = targetDatabase();
  const safeUrl = url.replace(/\/\/[^@/]*@/, "//");
  try {
    if (command === "backup") {
      const file = backupDatabase(url, option(args, "--file"));
      console.log(`Backed up ${safeUrl} to ${path.relative(process.cwd(), file) || file} (${(statSync(file).size / 1024).toFixed(0)} KB).`);
    } else if (command === "restore") {
      const file = path.resolve(args.find((a, i) => !a.startsWith("--") && args[i - 1] !== "--into") ?? newestBackup());
      const restored = await restoreDatabase(url, file, option(args, "--into"));
      console.log(`Restored ${path.relative(process.cwd(), file) || file} into ${restored.replace(/\/\/[^@/]*@/, "//")}.`);
    } else {
      throw new Error("Say `backup` or `restore` (npm run db:backup, npm run db:restore).");
    }
    done();
  } catch (error) {
    done();
    console.error((error as Error).message);
    process.exit(1);
  }
}
