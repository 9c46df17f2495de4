// Pieces shared by `npm start` and `npm test`: free ports, the app server process, waiting for it.
import { type ChildProcess, spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import path from "node:path";
import { createRequire } from "node:module";

// Ports already handed out by this process: the kernel may offer a port again as soon as the probe
// that found it is closed, so several asked for in a row (mail, payments, app) could otherwise collide.
const handedOut = new Set<number>();

/** Asks the kernel for a free TCP port on loopback, never one this process was given before. */
export async function freePort(): Promise<number> {
  for (;;) {
    const port = await new Promise<number>((resolve, reject) => {
      const server = createServer();
      server.unref();
      server.on("error", reject);
      server.listen(0, "127.0.0.1", () => {
        const address = server.address();
        const found = typeof address === "object" && address ? address.port : 0;
        server.close(() => resolve(found));
      });
    });
    if (!handedOut.has(port)) {
      handedOut.add(port);
      return port;
    }
  }
}

/** A session-signing secret kept in .data/ so sign-ins survive a restart of `npm start`. */
export function persistentAuthSecret(projectDir: string): string {
  const file = path.join(projectDir, ".data", "auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(path.dirname(file), { recursive: true });
  const secret = randomBytes(32).toString("base64url");
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

/** Starts the production build with react-router-serve, bound to 127.0.0.1 only. */
export function startAppServer(options: {
  buildDir: string;
  port: number;
  env: Record<string, string>;
  quiet?: boolean;
}): ChildProcess {
  const require = createRequire(import.meta.url);
  const serveBin = path.join(path.dirname(require.resolve("@react-router/serve/package.json")), "bin.js");
  const child = spawn(process.execPath, [serveBin, path.join(options.buildDir, "server", "index.js")], {
    env: {
      ...process.env,
      ...options.env,
      NODE_ENV: "production",
      PORT: String(options.port),
      HOST: "127.0.0.1",
      AUTH_TRUST_HOST: "true",
    },
    stdio: options.quiet ? ["ignore", "ignore", "inherit"] : ["ignore", "inherit", "inherit"],
  });
  return child;
}

/** Polls the health check until the server answers, or fails after the timeout. */
export async function waitForHttp(url: string, timeoutMs = 60_000, server?: ChildProcess): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let lastProblem = "";
  while (Date.now() < deadline) {
    if (server && server.exitCode !== null) throw new Error(`the app server stopped before answering (exit code ${server.exitCode})`);
    try {
      const response = await fetch(url);
      if (response.ok) return;
      lastProblem = `status ${response.status}`;
    } catch (error) {
      lastProblem = (error as Error).message;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s (${lastProblem})`);
}

/**
 * Starts the mail worker (drizzle/scripts/mail-worker.ts) as its own process beside the app, from the
 * same build. Stop it with SIGTERM: it finishes the e-mail in hand and ends.
 */
export function startMailWorkerProcess(options: { buildDir: string; env: Record<string, string>; quiet?: boolean }): ChildProcess {
  const script = path.join(path.dirname(new URL(import.meta.url).pathname), "mail-worker.ts");
  return spawn(process.execPath, ["--import", "tsx", script], {
    env: { ...process.env, ...options.env, NODE_ENV: "production", BENDWISE_BUILD_DIR: options.buildDir },
    stdio: options.quiet ? ["ignore", "ignore", "inherit"] : ["ignore", "inherit", "inherit"],
  });
}
