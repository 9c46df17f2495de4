// The in-process part of `npm run bench` (SQL statements per request, lesson compile vs cache). It is
// run by tests/bench/run.ts against the benchmark's own database, never by `npm test`.
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    root: fileURLToPath(new URL("../..", import.meta.url)),
    include: ["tests/bench/*.measure.ts"],
    testTimeout: 300_000,
    hookTimeout: 300_000,
    pool: "forks",
  },
});
