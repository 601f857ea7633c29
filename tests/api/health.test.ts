import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { HealthSchema } from "../../api/contracts/health";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, startTestServer } from "./support";

describe("GET /api/health", () => {
  let server: RunningServer;
  beforeAll(async () => {
    server = await startTestServer();
  });
  afterAll(() => server.close());

  it("answers ok when the server and the database answer", async () => {
    const res = await new ApiClient(server.url).get("/api/health");
    expect(res.status).toBe(200);
    expect(HealthSchema.parse(res.body)).toEqual({ ok: true });
  });

  it("answers 503 with the error shape when the database is gone", async () => {
    const broken = await startTestServer({ STILLPOINT_DB_PORT: "1" });
    try {
      const res = await new ApiClient(broken.url).get("/api/health");
      expect(res.status).toBe(503);
      expect(res.body).toMatchObject({ error: { code: "db_unavailable" } });
    } finally {
      await broken.close();
    }
  });

  it("answers unknown API routes with a JSON 404", async () => {
    const res = await new ApiClient(server.url).get("/api/no-such-thing");
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: "route_not_found", message: expect.any(String), details: null } });
  });
});
