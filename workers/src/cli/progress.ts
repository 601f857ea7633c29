// Progress bars on stderr, only when stderr is a terminal (never in pipes, logs or tests).

import { createRequire } from "node:module";

export interface Progress {
  update(value: number, total: number, label: string): void;
  stop(): void;
}

const SILENT: Progress = { update: () => {}, stop: () => {} };

export function progressBar(title: string, enabled = process.stderr.isTTY === true): Progress {
  if (!enabled) return SILENT;
  // Loaded only for a terminal: most runs (scripts, pipes, --json) never draw a bar.
  const cliProgress = createRequire(import.meta.url)("cli-progress") as typeof import("cli-progress");
  const bar = new cliProgress.SingleBar(
    { stream: process.stderr, format: `${title} [{bar}] {percentage}% {label}`, hideCursor: true, clearOnComplete: true },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    update(value, total, label) {
      if (!started) {
        bar.start(total, value, { label });
        started = true;
      } else {
        bar.setTotal(total);
        bar.update(value, { label });
      }
    },
    stop() {
      if (started) bar.stop();
    },
  };
}
