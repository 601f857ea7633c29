import type { Request, RequestHandler, Response } from "express";
import type { z } from "zod";
import type { Role } from "../../contracts/common";
import type { AppDeps } from "../deps";
import type { Principal } from "./principal";

export type Access = "public" | Role;
export type Method = "get" | "head" | "options" | "post" | "put" | "patch" | "delete";

type Schema = z.ZodType | undefined;
type Parsed<S extends Schema> = S extends z.ZodType ? z.output<S> : undefined;
type Result<S extends Schema> = S extends z.ZodType ? z.input<S> : void;

export interface RouteContext<A extends Access, B, Q, P> {
  body: B;
  query: Q;
  params: P;
  /** Present on every route that needs a role; public routes see the caller only when one is signed in. */
  principal: A extends "public" ? Principal | null : Principal;
  ip: string | null;
  deps: AppDeps;
  req: Request;
  res: Response;
}

export interface AuditSpec {
  action: string;
  target?: (params: unknown, result: unknown) => string | null;
}

interface RouteBase<A extends Access> {
  method: Method;
  /** Express path, e.g. `/api/team/members/:userId`. */
  path: string;
  access: A;
  summary: string;
  tag: string;
  /** Mutations must say how they reach the activity log: recorded after success here, or by the service itself. */
  audit?: AuditSpec | "by-service";
  /** Extra per-app middleware after the role and CSRF checks (e.g. a rate limiter). */
  middleware?: (deps: AppDeps) => RequestHandler[];
  status?: number;
  /** Raw routes only: documented response content types, e.g. `{ "text/csv": "the score file" }`. */
  produces?: Record<string, string>;
}

export interface RouteSpec<A extends Access, BS extends Schema, QS extends Schema, PS extends Schema, RS extends Schema>
  extends RouteBase<A> {
  body?: BS;
  query?: QS;
  params?: PS;
  /** Absent: the route answers 204 with no body. */
  response?: RS;
  handler: (ctx: RouteContext<A, Parsed<BS>, Parsed<QS>, Parsed<PS>>) => Promise<Result<RS>>;
}

/** A route with its types erased, as kept in the route table. */
export interface RouteDef extends RouteBase<Access> {
  schemas: { body?: z.ZodType; query?: z.ZodType; params?: z.ZodType; response?: z.ZodType };
  /** Raw routes write the response themselves (files, streams, the tus protocol). */
  raw: boolean;
  invoke: (ctx: RouteContext<Access, unknown, unknown, unknown>) => Promise<unknown>;
}

export function defineRoute<
  A extends Access,
  BS extends Schema = undefined,
  QS extends Schema = undefined,
  PS extends Schema = undefined,
  RS extends Schema = undefined,
>(spec: RouteSpec<A, BS, QS, PS, RS>): RouteDef {
  const { body, query, params, response, handler, ...base } = spec;
  return {
    ...base,
    schemas: { body, query, params, response },
    raw: false,
    // The mount step parses body/query/params with exactly these schemas before calling, which makes the cast sound.
    invoke: (ctx) => handler(ctx as RouteContext<A, Parsed<BS>, Parsed<QS>, Parsed<PS>>),
  };
}

export interface RawRouteSpec<A extends Access, QS extends Schema, PS extends Schema> extends RouteBase<A> {
  query?: QS;
  params?: PS;
  handler: (ctx: RouteContext<A, undefined, Parsed<QS>, Parsed<PS>>) => Promise<void>;
}

export function defineRawRoute<A extends Access, QS extends Schema = undefined, PS extends Schema = undefined>(
  spec: RawRouteSpec<A, QS, PS>,
): RouteDef {
  const { query, params, handler, ...base } = spec;
  return {
    ...base,
    schemas: { query, params },
    raw: true,
    invoke: (ctx) => handler(ctx as RouteContext<A, undefined, Parsed<QS>, Parsed<PS>>),
  };
}
