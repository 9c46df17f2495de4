// A private vitest config for the lesson content checks (tests/unit/lessons-content.test.ts):
// pure, no global setup, no database. The pure-test config beside it lists its own files only.
//   npx vitest run tests/unit/lessons-content.test.ts -c tests/unit/vitest.lessons.config.ts
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    include: ["tests/unit/lessons-content.test.ts"],
    testTimeout: 60_000,
  },
});
