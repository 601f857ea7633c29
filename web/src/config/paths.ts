type Path<Args extends unknown[] = []> = { path: string; getHref: (...args: Args) => string };

const withNext = (base: string, next?: string) =>
  next && next !== "/" ? `${base}?next=${encodeURIComponent(next)}` : base;

function withQuery(base: string, query: Record<string, string | number | undefined>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) if (value !== undefined && value !== "") params.set(key, String(value));
  const qs = params.toString();
  return qs ? `${base}?${qs}` : base;
}

export const paths = {
  auth: {
    signIn: {
      path: "/sign-in",
      getHref: (next?: string) => withNext("/sign-in", next),
    } satisfies Path<[string?]>,
    forgotPassword: { path: "/forgot-password", getHref: () => "/forgot-password" } satisfies Path,
    resetPassword: {
      path: "/reset/:token",
      getHref: (token: string) => `/reset/${encodeURIComponent(token)}`,
    } satisfies Path<[string]>,
    acceptInvite: {
      path: "/invite/:token",
      getHref: (token: string) => `/invite/${encodeURIComponent(token)}`,
    } satisfies Path<[string]>,
  },
  app: {
    overview: { path: "/", getHref: () => "/" } satisfies Path,
    graphs: { path: "/graphs", getHref: () => "/graphs" } satisfies Path,
    graph: {
      path: "/graphs/:graphId",
      getHref: (graphId: number) => `/graphs/${graphId}`,
    } satisfies Path<[number]>,
    newRun: {
      path: "/runs/new",
      getHref: (graphId?: number) => (graphId ? `/runs/new?graph=${graphId}` : "/runs/new"),
    } satisfies Path<[number?]>,
    runs: {
      path: "/runs",
      getHref: (filter?: { graphId?: number; status?: string }) => withQuery("/runs", { graph: filter?.graphId, status: filter?.status }),
    } satisfies Path<[{ graphId?: number; status?: string }?]>,
    run: {
      path: "/runs/:runId",
      getHref: (runId: number) => `/runs/${runId}`,
    } satisfies Path<[number]>,
    runResults: {
      path: "/runs/:runId/results",
      getHref: (runId: number) => `/runs/${runId}/results`,
    } satisfies Path<[number]>,
    compare: {
      path: "/compare",
      getHref: (a?: number, b?: number) => withQuery("/compare", { a, b }),
    } satisfies Path<[number?, number?]>,
    team: { path: "/team", getHref: () => "/team" } satisfies Path,
    tokens: { path: "/tokens", getHref: () => "/tokens" } satisfies Path,
    activity: { path: "/activity", getHref: () => "/activity" } satisfies Path,
    outbox: {
      path: "/outbox",
      getHref: (messageId?: number) =>
        messageId ? `/outbox?message=${messageId}` : "/outbox",
    } satisfies Path<[number?]>,
  },
} as const;
