type Path<Args extends unknown[] = []> = { path: string; getHref: (...args: Args) => string };

const withNext = (base: string, next?: string) =>
  next && next !== "/" ? `${base}?next=${encodeURIComponent(next)}` : base;

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
    newRun: { path: "/runs/new", getHref: () => "/runs/new" } satisfies Path,
    runs: { path: "/runs", getHref: () => "/runs" } satisfies Path,
    compare: { path: "/compare", getHref: () => "/compare" } satisfies Path,
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
