// A private vitest config for the pure unit tests (science, answer checker, seeded random):
// no global setup, no database, so they run on their own while the app's own config grows.
//   npx vitest run -c tests/unit/vitest.pure.config.ts
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

export default defineConfig({
  root: fileURLToPath(new URL("../..", import.meta.url)),
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    include: [
      "tests/unit/science*.test.ts",
      "tests/unit/answer-checker*.test.ts",
      "tests/unit/seeded-random*.test.ts",
      "tests/unit/analysis-request*.test.ts",
    ],
    testTimeout: 60_000,
  },
});
