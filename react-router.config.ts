import type { Config } from "@react-router/dev/config";

export default {
  appDirectory: "app",
  ssr: true,
  // `npm test` builds into a folder of its own so a test run never overwrites the build `npm start` serves.
  buildDirectory: process.env.BENDWISE_BUILD_DIR ?? "build",
} satisfies Config;
