// `npm run db:backup` and `npm run db:restore` (pg_dump and pg_restore, custom format) round-trip the
// demo data: every table of every schema (the app's, Drizzle's migrations, the mail queue's) has the
// same rows and the same checksum in a fresh database restored from the backup, and a restore over a
// database that has since changed puts it back exactly. The scripts run as `npm run` would run them.
import { execFile } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import postgres from "postgres";
import { afterAll, describe, expect, it } from "vitest";
import { snapshotDatabase } from "./db-snapshot";

const run = promisify(execFile);
const source = process.env.DATABASE_URL!;
const folder = mkdtempSync(path.join(tmpdir(), "bendwise-backups-"));
const fresh = `restored_${process.pid}_${Date.now()}`;
const freshUrl = source.replace(/\/[^/]*$/, `/${fresh}`);
const admin = source.replace(/\/[^/]*$/, "/postgres");

const npm = (script: string, args: string[]) =>
  run("npm", ["run", "-s", script, "--", ...args], { env: { ...process.env, DATABASE_URL: source, BENDWISE_BACKUP_DIR: folder }, cwd: process.cwd(), timeout: 120_000 });

afterAll(async () => {
  const client = postgres(admin, { max: 1, onnotice: () => {} });
  await client.unsafe(`drop database if exists "${fresh}" with (force)`);
  await client.end();
  rmSync(folder, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("backs the demo data up to .data/backups-style files and restores it into a fresh database, table for table", async () => {
    const before = await snapshotDatabase(source);
    expect(before.get("public.users")!.rows).toBeGreaterThan(10);
    expect([...before.keys()].some((t) => t.startsWith("pgboss."))).toBe(true);

    const backedUp = await npm("db:backup", []);
    expect(backedUp.stdout).toMatch(/Backed up .* to .*bendwise-\d{8}-\d{6}\.dump/);
    const files = readdirSync(folder).filter((f) => f.endsWith(".dump"));
    expect(files).toHaveLength(1);

    // No file named: the newest backup in the folder; --into: a database made for it.
    const restored = await npm("db:restore", ["--into", fresh]);
    expect(restored.stdout).toMatch(new RegExp(`Restored .*${files[0]} into .*/${fresh}`));
    expect(await snapshotDatabase(freshUrl)).toEqual(before);
    expect(await snapshotDatabase(source), "the backup changed the database it read").toEqual(before);
  }, 180_000);

  it("restores over a database that has changed since, putting back exactly what was backed up", async () => {
    const file = path.join(folder, "named.dump");
    await npm("db:backup", ["--file", file]);
    expect(existsSync(file)).toBe(true);
    const before = await snapshotDatabase(source);
    const client = postgres(freshUrl, { max: 1, onnotice: () => {} });
    await client`delete from exercise_attempts`;
    await client`update users set display_name = 'changed after the backup'`;
    await client.end();
    expect(await snapshotDatabase(freshUrl)).not.toEqual(before);

    await npm("db:restore", [file, "--into", fresh]);
    expect(await snapshotDatabase(freshUrl)).toEqual(before);
  }, 180_000);

  it("says so, and changes nothing, when there is no such backup file", async () => {
    const before = await snapshotDatabase(freshUrl);
    await expect(npm("db:restore", [path.join(folder, "missing.dump"), "--into", fresh])).rejects.toMatchObject({ stderr: expect.stringMatching(/There is no backup file/) });
    expect(await snapshotDatabase(freshUrl)).toEqual(before);
  }, 60_000);
});
