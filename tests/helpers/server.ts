// Starts the built app (`next start`) on a free local port with the given environment, for
// integration tests that need real HTTP. `npm test` builds the app before the integration tests.
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import { createServer } from "node:net";
import path from "node:path";

const ROOT = path.resolve(__dirname, "..", "..");

export interface RunningServer {
  url: string;
  output: () => string;
  stop: () => Promise<void>;
  /** SIGKILL, as a crash or the OOM killer would; resolves when the process is gone */
  kill: () => Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

/** `next start` on 127.0.0.1 with exactly `env` added to a clean copy of this process's environment. */
export async function startServer(env: Record<string, string | undefined>, readyPath = "/traces"): Promise<RunningServer> {
  if (!existsSync(path.join(ROOT, ".next", "BUILD_ID"))) {
    throw new Error("no build of the app: run `node node_modules/next/dist/bin/next build` first (npm test does)");
  }
  const port = await freePort();
  const childEnv: Record<string, string> = { NEXT_TELEMETRY_DISABLED: "1" };
  for (const [k, v] of Object.entries({ ...process.env, ...env })) if (v !== undefined) childEnv[k] = v;
  const child: ChildProcess = spawn(process.execPath, [path.join(ROOT, "node_modules", "next", "dist", "bin", "next"), "start", "-H", "127.0.0.1", "-p", String(port)], {
    cwd: ROOT,
    env: childEnv as NodeJS.ProcessEnv,
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  child.stdout!.on("data", (d) => (log += d));
  child.stderr!.on("data", (d) => (log += d));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`next start exited with ${child.exitCode}:\n${log}`);
    try {
      const res = await fetch(url + readyPath);
      if (res.status < 500) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`next start did not answer within 60 s:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return {
    url,
    output: () => log,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGTERM");
      }),
    kill: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill("SIGKILL");
      }),
  };
}
