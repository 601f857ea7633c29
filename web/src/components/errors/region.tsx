import { QueryErrorResetBoundary } from "@tanstack/react-query";
import { Suspense, type ReactNode } from "react";
import { Button } from "../ui/button";
import { ErrorBanner } from "../ui/error-banner";
import { Loading } from "../ui/loading";
import { ErrorBoundary } from "./error-boundary";

/** One page region: its own loading state and its own error, so a failure stays local. */
export function Region({ loadingLabel, errorTitle, children }: { loadingLabel?: string; errorTitle?: string; children: ReactNode }) {
  return (
    <QueryErrorResetBoundary>
      {({ reset }) => (
        <ErrorBoundary
          onReset={reset}
          fallback={(error, retry) => (
            <ErrorBanner
              error={error}
              title={errorTitle}
              action={
                <Button size="sm" variant="secondary" onClick={retry}>
                  Try again
                </Button>
              }
            />
          )}
        >
          <Suspense fallback={<Loading label={loadingLabel} />}>{children}</Suspense>
        </ErrorBoundary>
      )}
    </QueryErrorResetBoundary>
  );
}
