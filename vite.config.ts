import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { fileURLToPath } from "node:url";
import { defineConfig } from "vitest/config";

// Under vitest the React Router plugin is left out: tests import modules directly.
const underVitest = Boolean(process.env.VITEST);

export default defineConfig({
  plugins: underVitest ? [] : [tailwindcss(), reactRouter()],
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  // Fonts stay files of their own (never inlined as data: URLs), so the browser caches them
  // and the content-security policy can keep font-src to the app's own origin.
  build: { assetsInlineLimit: (file) => (/\.(woff2?|ttf|otf)$/.test(file) ? false : undefined) },
  server: { host: "127.0.0.1" },
  preview: { host: "127.0.0.1" },
  test: {
    testTimeout: 20_000,
    hookTimeout: 60_000,
    pool: "forks",
    // Three kinds of test. Unit tests need nothing running (`npx vitest run tests/unit/x.test.ts` works
    // on its own); integration tests get a database of their own per file from the template `npm test`
    // prepares; browser tests run last, one file at a time, against the production build.
    projects: process.env.BENDWISE_BROWSER
      ? [{ extends: true, test: { name: "browser", include: ["tests/browser/**/*.test.ts"], fileParallelism: false } }]
      : [
          { extends: true, test: { name: "unit", include: ["tests/unit/**/*.test.ts"] } },
          {
            extends: true,
            test: { name: "integration", include: ["tests/integration/**/*.test.ts"], setupFiles: ["tests/setup/each-file.ts"] },
          },
        ],
  },
});
