import { randomBytes } from "node:crypto";
import { inject } from "vitest";
import type { Role } from "../../api/contracts/common";
import { loadConfig, type Config } from "../../api/src/config";
import { insertTeam, insertUser, upsertMembership } from "../../api/src/features/team/team.repo";
import { hashPassword } from "../../api/src/lib/passwords";
import { startServer, type RunningServer } from "../../api/src/server";

export const PASSWORD = "harbour-lights-42";

export function testConfig(overrides: Record<string, string> = {}): Config {
  const db = inject("db");
  return loadConfig({
    NODE_ENV: "test",
    STILLPOINT_PORT: "0",
    STILLPOINT_DB_HOST: db.host,
    STILLPOINT_DB_PORT: String(db.port),
    STILLPOINT_DB_USER: db.user,
    STILLPOINT_DB_PASSWORD: db.password,
    STILLPOINT_DB_NAME: db.database,
    STILLPOINT_SESSION_SECRET: inject("sessionSecret"),
    STILLPOINT_FAKE_SMTP: "1",
    STILLPOINT_DATA_DIR: ".test-data",
    ...overrides,
  });
}

export function startTestServer(overrides: Record<string, string> = {}): Promise<RunningServer> {
  return startServer(testConfig(overrides));
}

export function unique(label: string): string {
  return `${label}-${randomBytes(4).toString("hex")}`;
}

export interface TestTeam {
  teamId: number;
  name: string;
  /** E-mail address per role, all with the password PASSWORD. */
  email: Record<Role, string>;
  userId: Record<Role, number>;
}

/** A fresh team with one admin, one engineer and one viewer, unique to the calling test. */
export async function createTestTeam(server: RunningServer, label = "team"): Promise<TestTeam> {
  const { db } = server.deps;
  const name = unique(`Kestrel ${label}`);
  const teamId = await insertTeam(db, name);
  const passwordHash = await hashPassword(PASSWORD);
  const email = {} as Record<Role, string>;
  const userId = {} as Record<Role, number>;
  for (const role of ["admin", "engineer", "viewer"] as const) {
    email[role] = `${unique(role)}@kestrel.example`;
    userId[role] = await insertUser(db, { email: email[role], name: `Test ${role}`, passwordHash });
    await upsertMembership(db, teamId, userId[role], role);
  }
  return { teamId, name, email, userId };
}

export interface ApiResponse<T = unknown> {
  status: number;
  headers: Headers;
  body: T;
}

/** A small HTTP client with one cookie jar, like a browser tab, that sends the CSRF token when it has one. */
export class ApiClient {
  cookies = new Map<string, string>();
  csrfToken: string | null = null;
  bearer: string | null = null;

  constructor(public baseUrl: string) {}

  async request<T = unknown>(
    method: string,
    path: string,
    options: { json?: unknown; csrf?: boolean; headers?: Record<string, string> } = {},
  ): Promise<ApiResponse<T>> {
    const headers: Record<string, string> = { ...options.headers };
    if (options.json !== undefined) headers["content-type"] = "application/json";
    if (this.cookies.size > 0) headers.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
    if (this.bearer) headers.authorization = `Bearer ${this.bearer}`;
    if ((options.csrf ?? true) && this.csrfToken) headers["x-csrf-token"] = this.csrfToken;
    const res = await fetch(this.baseUrl + path, {
      method,
      headers,
      body: options.json === undefined ? undefined : JSON.stringify(options.json),
    });
    for (const cookie of res.headers.getSetCookie()) {
      const [pair] = cookie.split(";");
      const [name, ...value] = pair.split("=");
      if (/expires=Thu, 01 Jan 1970/i.test(cookie)) this.cookies.delete(name);
      else this.cookies.set(name, value.join("="));
    }
    const text = await res.text();
    const body = (text && res.headers.get("content-type")?.includes("json") ? JSON.parse(text) : text) as T;
    return { status: res.status, headers: res.headers, body };
  }

  get<T = unknown>(path: string) {
    return this.request<T>("GET", path);
  }

  post<T = unknown>(path: string, json?: unknown, options: { csrf?: boolean } = {}) {
    return this.request<T>("POST", path, { json, ...options });
  }

  async signIn(email: string, password = PASSWORD): Promise<ApiResponse<{ csrfToken: string; role: Role }>> {
    const res = await this.post<{ csrfToken: string; role: Role }>("/api/auth/sign-in", { email, password });
    if (res.status === 200) this.csrfToken = res.body.csrfToken;
    return res;
  }
}

export async function signedIn(server: RunningServer, email: string): Promise<ApiClient> {
  const client = new ApiClient(server.url);
  const res = await client.signIn(email);
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return client;
}
