import type { QueryClient } from "@tanstack/react-query";
import { redirect, useLocation, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { AuthLayout } from "../../../components/layouts/auth-layout";
import { Notice } from "../../../components/ui/error-banner";
import { paths } from "../../../config/paths";
import { sessionQueryOptions } from "../../../lib/auth";
import { SignInForm } from "../../../features/auth/components/sign-in-form";

/** Only same-site paths are followed after sign-in, so a crafted link cannot bounce users elsewhere. */
export function safeNext(value: string | null): string {
  return value && value.startsWith("/") && !value.startsWith("//") ? value : paths.app.overview.getHref();
}

export const makeLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const session = await queryClient.ensureQueryData(sessionQueryOptions());
  if (session) return redirect(safeNext(new URL(request.url).searchParams.get("next")));
  return null;
};

export type SignInState = { notice?: string; email?: string };

export function Component() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const state = (useLocation().state ?? {}) as SignInState;

  return (
    <AuthLayout
      title="Sign in"
      description="Use the e-mail address your team invited."
      footer="New here? Ask an admin of your team for an invitation."
    >
      {state.notice ? <Notice className="mb-4">{state.notice}</Notice> : null}
      <SignInForm
        defaultEmail={state.email}
        onSuccess={() => void navigate(safeNext(params.get("next")), { replace: true })}
      />
    </AuthLayout>
  );
}
