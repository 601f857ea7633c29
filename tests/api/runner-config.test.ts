import { describe, expect, it } from "vitest";
import { loadRunnerConfig } from "../../workers/src/runner/config";
import { isTransientDbError, retryDb } from "../../workers/src/runner/db-retry";

const FAULTS = JSON.stringify([{ shard: 1, iteration: 4, attempt: 1, kind: "throw" }]);

describe("runner settings", () => {
  it("reads its own variables next to the shared ones, with an absolute data directory", () => {
    const c = loadRunnerConfig({
      NODE_ENV: "development",
      STILLPOINT_DATA_DIR: "relative-data",
      STILLPOINT_RUNNER_ID: "harbour-runner-1",
      STILLPOINT_RUNNER_THREADS: "3",
      STILLPOINT_RUNNER_LEASE_MS: "10000",
      STILLPOINT_RUNNER_HEARTBEAT_MS: "1000",
      STILLPOINT_RUNNER_TEAMS: "4,9",
      STILLPOINT_RUNNER_RETRY: JSON.stringify({ attempts: 5 }),
      STILLPOINT_PUBLIC_URL: "https://stillpoint.kestrel.example/",
    });
    expect(c).toMatchObject({ runnerId: "harbour-runner-1", threads: 3, leaseMs: 10_000, heartbeatMs: 1_000, teams: [4, 9] });
    expect(c.retry).toEqual({ attempts: 5, backoffMs: 100, taskTimeoutMs: 120_000 });
    expect(c.dataDir.startsWith("/")).toBe(true);
    expect(c.dataDir.endsWith("/relative-data")).toBe(true);
    expect(c.publicUrl).toBe("https://stillpoint.kestrel.example");
    expect(c.softwareVersion).toMatch(/^\d+\.\d+\.\d+/);
  });

  it("honours fault injection only in tests or when explicitly allowed", () => {
    expect(loadRunnerConfig({ NODE_ENV: "development", STILLPOINT_FAULTS: FAULTS }).faults).toEqual([]);
    expect(loadRunnerConfig({ NODE_ENV: "test", STILLPOINT_FAULTS: FAULTS }).faults).toEqual([{ shard: 1, iteration: 4, attempt: 1, kind: "throw" }]);
    expect(loadRunnerConfig({ NODE_ENV: "development", STILLPOINT_TEST_FAULTS: "1", STILLPOINT_FAULTS: FAULTS }).faults).toHaveLength(1);
  });

  it("lists every invalid runner variable at once", () => {
    expect(() =>
      loadRunnerConfig({ NODE_ENV: "test", STILLPOINT_RUNNER_THREADS: "0", STILLPOINT_FAULTS: "not json", STILLPOINT_RUNNER_TEAMS: "a,b" }),
    ).toThrow(/STILLPOINT_RUNNER_THREADS[\s\S]*STILLPOINT_FAULTS[\s\S]*STILLPOINT_RUNNER_TEAMS/);
    expect(() => loadRunnerConfig({ STILLPOINT_RUNNER_LEASE_MS: "1000", STILLPOINT_RUNNER_HEARTBEAT_MS: "800" })).toThrow(/twice the heartbeat/);
  });
});

describe("database retry", () => {
  const lost = Object.assign(new Error("Connection lost: The server closed the connection."), { code: "PROTOCOL_CONNECTION_LOST", fatal: true });

  it("tells connection problems (also wrapped by the query builder) from query errors", () => {
    expect(isTransientDbError(lost)).toBe(true);
    expect(isTransientDbError(new Error("Failed query: insert …", { cause: Object.assign(new Error("connect ECONNREFUSED"), { code: "ECONNREFUSED" }) }))).toBe(true);
    expect(isTransientDbError(Object.assign(new Error("Duplicate entry"), { code: "ER_DUP_ENTRY", errno: 1062 }))).toBe(false);
    expect(isTransientDbError("ECONNREFUSED")).toBe(false);
  });

  it("retries transient failures with growing waits and gives other errors straight back", async () => {
    let calls = 0;
    const seen: number[] = [];
    const value = await retryDb(
      "probe",
      async () => {
        if (++calls < 3) throw lost;
        return "ok";
      },
      { onRetry: (attempt) => seen.push(attempt) },
    );
    expect(value).toBe("ok");
    expect(seen).toEqual([1, 2]);

    calls = 0;
    await expect(retryDb("probe", async () => {
      calls++;
      throw new Error("syntax error");
    })).rejects.toThrow("syntax error");
    expect(calls).toBe(1);

    await expect(retryDb("probe", async () => Promise.reject(lost), { giveUp: () => true })).rejects.toBe(lost);
  });
});
