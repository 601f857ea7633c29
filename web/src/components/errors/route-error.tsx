import { isRouteErrorResponse, Link, useRouteError } from "react-router-dom";
import { paths } from "../../config/paths";
import { getErrorMessage } from "../../lib/api-client";
import { buttonClasses } from "../ui/button";
import { Wordmark } from "../ui/wordmark";

export function RouteError() {
  const error = useRouteError();
  return <ErrorPage error={error} notFound={isRouteErrorResponse(error) && error.status === 404} />;
}

export function NotFound() {
  return <ErrorPage error={null} notFound />;
}

function ErrorPage({ error, notFound }: { error: unknown; notFound: boolean }) {
  return (
    <div className="flex min-h-screen items-center justify-center px-4">
      <div role="alert" className="w-full max-w-md rounded-lg border border-rule bg-paper-raised px-6 py-6">
        <Wordmark />
        <h1 className="mt-4 text-lg font-semibold text-ink">{notFound ? "There is no page here" : "This page failed"}</h1>
        <p className="mt-1 text-[0.8125rem] text-ink-muted">
          {notFound
            ? "The address may be mistyped, or the page was moved."
            : isRouteErrorResponse(error)
              ? `${error.status} ${error.statusText}`
              : getErrorMessage(error)}
        </p>
        <Link to={paths.app.overview.getHref()} className={`${buttonClasses("secondary", "sm")} mt-4`}>
          Back to the overview
        </Link>
      </div>
    </div>
  );
}
