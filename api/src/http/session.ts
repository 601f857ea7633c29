import { createRequire } from "node:module";
import type { Request, RequestHandler } from "express";
import session, { type Store } from "express-session";
import type { AppDeps } from "../deps";
import { randomSecret } from "../lib/secrets";
import type { Principal } from "./principal";

export const SESSION_COOKIE = "stillpoint.sid";
const SESSION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

interface MySqlStore extends Store {
  close(): Promise<void>;
}
type MySqlStoreClass = new (options: Record<string, unknown>, connection: AppDeps["pool"]) => MySqlStore;

// express-mysql-session ships no types; this is the part of its API we use.
const require = createRequire(import.meta.url);
const createStoreClass = require("express-mysql-session") as (s: typeof session) => MySqlStoreClass;

export interface SessionLayer {
  middleware: RequestHandler;
  close(): Promise<void>;
}

export function createSessionLayer(deps: AppDeps): SessionLayer {
  const MySQLStore = createStoreClass(session);
  const store = new MySQLStore(
    {
      // The sessions table is created by our migrations, not by the store.
      createDatabaseTable: false,
      clearExpired: true,
      checkExpirationInterval: 15 * 60 * 1000,
      expiration: SESSION_TTL_MS,
      endConnectionOnClose: false,
    },
    deps.pool,
  );
  const middleware = session({
    name: SESSION_COOKIE,
    secret: deps.sessionSecret,
    store,
    resave: false,
    saveUninitialized: false,
    proxy: deps.config.trustProxy,
    cookie: {
      httpOnly: true,
      sameSite: "lax",
      secure: deps.config.env === "production",
      maxAge: SESSION_TTL_MS,
      path: "/",
    },
  });
  return { middleware, close: () => store.close() };
}

const promisify = (run: (done: (error: unknown) => void) => void) =>
  new Promise<void>((resolve, reject) => run((error) => (error ? reject(error) : resolve())));

/** Starts a fresh session for the principal (a new id, so a planted id never gains rights); returns its CSRF token. */
export async function startSession(req: Request, principal: Principal): Promise<string> {
  await promisify((done) => req.session.regenerate(done));
  const csrfToken = randomSecret("", 24);
  req.session.userId = principal.userId;
  req.session.teamId = principal.teamId;
  req.session.csrfToken = csrfToken;
  await promisify((done) => req.session.save(done));
  return csrfToken;
}

export async function endSession(req: Request): Promise<void> {
  if (!req.session) return;
  await promisify((done) => req.session.destroy(done));
}
