import type { Config } from "@react-router/dev/config";

export default {
  appDirectory: "app",
  ssr: true,
  // Every route's entry goes to the browser in one small cached file at the first page, instead of a
  // lookup of the routes near the address in every page the server renders and a /__manifest request
  // on a later click: Bendwise has a few dozen routes, so the file is small (see README, "Measured speed").
  routeDiscovery: { mode: "initial" },
  // `npm test` builds into a folder of its own so a test run never overwrites the build `npm start` serves.
  buildDirectory: process.env.BENDWISE_BUILD_DIR ?? "build",
} satisfies Config;
