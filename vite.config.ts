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
    // `npm test` runs unit and integration tests first, then the browser tests against the production build.
    include: process.env.BENDWISE_BROWSER
      ? ["tests/browser/**/*.test.ts"]
      : ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    setupFiles: process.env.BENDWISE_BROWSER ? [] : ["tests/setup/each-file.ts"],
    fileParallelism: !process.env.BENDWISE_BROWSER,
    testTimeout: 20_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
