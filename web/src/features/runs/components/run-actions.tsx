import { useState } from "react";
import { RETRYABLE_RUN_STATUSES } from "#contracts/runs";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { isLiveRun } from "../../../lib/status";
import type { RunDetail } from "../api/get-run";
import { useCancelRun, useRetryRun } from "../api/run-actions";

/** Cancel while a run is queued or running; retry the failed shards of a run that needs attention or failed. */
export function RunActions({ run, canAct }: { run: RunDetail; canAct: boolean }) {
  const cancel = useCancelRun();
  const retry = useRetryRun();
  const [confirming, setConfirming] = useState(false);
  if (!canAct) return null;

  const canCancel = isLiveRun(run.status) && !run.cancelRequested;
  const canRetry = RETRYABLE_RUN_STATUSES.includes(run.status) && !run.retryRequested;
  const error = cancel.error ?? retry.error;

  return (
    <div className="flex flex-col items-end gap-2">
      <div className="flex items-center gap-2">
        {run.cancelRequested && isLiveRun(run.status) ? <span role="status" className="text-[0.8125rem] text-ink-muted">Canceling…</span> : null}
        {run.retryRequested ? <span role="status" className="text-[0.8125rem] text-ink-muted">Retry requested…</span> : null}
        {canRetry ? (
          <Button variant="primary" busy={retry.isPending} onClick={() => retry.mutate({ id: run.id })}>
            Retry failed shards
          </Button>
        ) : null}
        {canCancel ? (
          confirming ? (
            <>
              <Button variant="danger" busy={cancel.isPending} onClick={() => cancel.mutate({ id: run.id }, { onSettled: () => setConfirming(false) })}>
                Confirm cancel
              </Button>
              <Button variant="quiet" onClick={() => setConfirming(false)}>
                Keep running
              </Button>
            </>
          ) : (
            <Button variant="danger" onClick={() => setConfirming(true)}>
              Cancel run
            </Button>
          )
        ) : null}
      </div>
      {error ? <ErrorBanner error={error} title="The action failed" /> : null}
    </div>
  );
}
