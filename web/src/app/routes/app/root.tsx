import type { QueryClient } from "@tanstack/react-query";
import { Outlet, redirect, type LoaderFunctionArgs } from "react-router-dom";
import { AppLayout, type NavGroup } from "../../../components/layouts/app-layout";
import { paths } from "../../../config/paths";
import { ROLE_LABELS, sessionQueryOptions, useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { useSignOut } from "../../../features/auth/api/sign-out";
import { useOutboxAvailable } from "../../../features/outbox/api/get-outbox";

export const makeLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (!session) {
    const url = new URL(request.url);
    return redirect(paths.auth.signIn.getHref(url.pathname + url.search));
  }
  return null;
};

export function Component() {
  const session = useSession();
  const signOut = useSignOut();
  const outboxAvailable = useOutboxAvailable(can(session.role, "outbox:view"));

  const nav: NavGroup[] = [
    {
      label: "Ranking",
      items: [
        { label: "Overview", href: paths.app.overview.getHref(), end: true },
        { label: "Graphs", href: paths.app.graphs.getHref() },
        ...(can(session.role, "runs:submit") ? [{ label: "New run", href: paths.app.newRun.getHref() }] : []),
        { label: "Runs", href: paths.app.runs.getHref(), end: true },
        { label: "Compare", href: paths.app.compare.getHref() },
      ],
    },
    {
      label: "Team",
      items: [
        { label: "Team", href: paths.app.team.getHref() },
        { label: "API tokens", href: paths.app.tokens.getHref() },
        ...(can(session.role, "activity:view") ? [{ label: "Activity", href: paths.app.activity.getHref() }] : []),
        ...(outboxAvailable ? [{ label: "Outbox", href: paths.app.outbox.getHref(), note: "dev" }] : []),
      ],
    },
  ];

  return (
    <AppLayout
      nav={nav}
      user={{
        name: session.user.name || session.user.email,
        email: session.user.email,
        roleLabel: ROLE_LABELS[session.role],
        teamName: session.team.name,
      }}
      signingOut={signOut.isPending}
      onSignOut={() => signOut.mutate()}
    >
      <Outlet />
    </AppLayout>
  );
}
