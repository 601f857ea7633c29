import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { useMemo, type ComponentType } from "react";
import { createBrowserRouter, RouterProvider, type LoaderFunction } from "react-router-dom";
import { NotFound, RouteError } from "../components/errors/route-error";
import { Loading } from "../components/ui/loading";
import { paths } from "../config/paths";

type RouteModule = {
  Component: ComponentType;
  makeLoader?: (queryClient: QueryClient) => LoaderFunction;
};

// Route modules export a component and, optionally, a loader factory that closes over the query client.
const convert = (queryClient: QueryClient) => (module: RouteModule) => ({
  Component: module.Component,
  loader: module.makeLoader?.(queryClient),
});

function createAppRouter(queryClient: QueryClient) {
  const load = convert(queryClient);
  return createBrowserRouter([
    {
      path: paths.auth.signIn.path,
      lazy: () => import("./routes/auth/sign-in").then(load),
      errorElement: <RouteError />,
      HydrateFallback: Loading,
    },
    {
      path: paths.auth.forgotPassword.path,
      lazy: () => import("./routes/auth/forgot-password").then(load),
      errorElement: <RouteError />,
      HydrateFallback: Loading,
    },
    {
      path: paths.auth.resetPassword.path,
      lazy: () => import("./routes/auth/reset-password").then(load),
      errorElement: <RouteError />,
      HydrateFallback: Loading,
    },
    {
      path: paths.auth.acceptInvite.path,
      lazy: () => import("./routes/auth/accept-invite").then(load),
      errorElement: <RouteError />,
      HydrateFallback: Loading,
    },
    {
      path: paths.app.overview.path,
      lazy: () => import("./routes/app/root").then(load),
      errorElement: <RouteError />,
      HydrateFallback: Loading,
      children: [
        { index: true, lazy: () => import("./routes/app/overview").then(load) },
        { path: paths.app.graphs.path, lazy: () => import("./routes/app/graphs").then(load) },
        { path: paths.app.graph.path, lazy: () => import("./routes/app/graph").then(load) },
        { path: paths.app.newRun.path, lazy: () => import("./routes/app/new-run").then(load) },
        { path: paths.app.runs.path, lazy: () => import("./routes/app/runs").then(load) },
        { path: paths.app.run.path, lazy: () => import("./routes/app/run").then(load) },
        { path: paths.app.runResults.path, lazy: () => import("./routes/app/run").then(load) },
        { path: paths.app.compare.path, lazy: () => import("./routes/app/compare").then(load) },
        { path: paths.app.team.path, lazy: () => import("./routes/app/team").then(load) },
        { path: paths.app.tokens.path, lazy: () => import("./routes/app/tokens").then(load) },
        { path: paths.app.activity.path, lazy: () => import("./routes/app/activity").then(load) },
        { path: paths.app.outbox.path, lazy: () => import("./routes/app/outbox").then(load) },
      ],
    },
    { path: "*", Component: NotFound },
  ]);
}

export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createAppRouter(queryClient), [queryClient]);
  return <RouterProvider router={router} />;
}
