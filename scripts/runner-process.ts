// The runner as a child process of `npm start`: restarted with backoff if it dies, stopped with SIGTERM (it
// checkpoints its run and hands it back), killed only if it does not exit in time.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";

const ROOT = path.resolve(import.meta.dirname, "..");
const RUNNER_MAIN = path.join(ROOT, "workers", "src", "runner", "main.ts");
const STOP_TIMEOUT_MS = 30_000;
const MAX_BACKOFF_MS = 30_000;

export interface RunnerProcess {
  name: string;
  readonly pid: number | undefined;
  stop(): Promise<void>;
}

export function startRunnerProcess(env: NodeJS.ProcessEnv, log: (line: string) => void = console.log): RunnerProcess {
  let child: ChildProcess | null = null;
  let stopping = false;
  let restarts = 0;
  let restartTimer: NodeJS.Timeout | null = null;

  const launch = () => {
    const started = Date.now();
    const proc = spawn(process.execPath, ["--import", "tsx", RUNNER_MAIN], { cwd: ROOT, env, stdio: ["ignore", "inherit", "inherit"] });
    child = proc;
    proc.once("exit", (code, signal) => {
      if (child === proc) child = null;
      if (stopping) return;
      // A runner that stayed up a while gets a fresh backoff.
      if (Date.now() - started > 60_000) restarts = 0;
      const wait = Math.min(MAX_BACKOFF_MS, 1_000 * 2 ** restarts++);
      log(`runner exited (${signal ?? `code ${code}`}); starting it again in ${wait / 1000} s`);
      restartTimer = setTimeout(launch, wait);
    });
  };
  launch();

  return {
    name: "runner",
    get pid() {
      return child?.pid;
    },
    async stop() {
      stopping = true;
      if (restartTimer) clearTimeout(restartTimer);
      const proc = child;
      if (!proc || proc.exitCode !== null || proc.signalCode !== null) return;
      const exited = new Promise<void>((resolve) => proc.once("exit", () => resolve()));
      proc.kill("SIGTERM");
      const timer = setTimeout(() => {
        log(`runner did not stop within ${STOP_TIMEOUT_MS / 1000} s; killing it`);
        proc.kill("SIGKILL");
      }, STOP_TIMEOUT_MS);
      await exited;
      clearTimeout(timer);
    },
  };
}
