import { useState } from "react";
import { FINISHED_RUN_STATUSES, RETRYABLE_RUN_STATUSES } from "#contracts/runs";
import { Button } from "../../../components/ui/button";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { isLiveRun } from "../../../lib/status";
import { retryPending, type RunDetail } from "../api/get-run";
import { useCancelRun, useDeleteRun, useRetryRun } from "../api/run-actions";

type RunActionsProps = {
  run: RunDetail;
  canAct: boolean;
  /** Submitters delete their own finished runs; admins any. */
  canDelete: boolean;
  onDeleted: () => void;
};

/** Cancel while a run is queued or running; retry the failed shards of a run that needs attention or failed; delete a finished one. */
export function RunActions({ run, canAct, canDelete, onDeleted }: RunActionsProps) {
  const cancel = useCancelRun();
  const retry = useRetryRun();
  const remove = useDeleteRun();
  const [confirming, setConfirming] = useState<"cancel" | "delete" | null>(null);
  if (!canAct) return null;

  const canCancel = isLiveRun(run.status) && !run.cancelRequested;
  const canRetry = RETRYABLE_RUN_STATUSES.includes(run.status) && !retryPending(run);
  const deletable = canDelete && FINISHED_RUN_STATUSES.includes(run.status) && !retryPending(run);
  const error = cancel.error ?? retry.error ?? remove.error;

  return (
    <div className="flex flex-col items-end gap-2">
      <div className="flex items-center gap-2">
        {run.cancelRequested && isLiveRun(run.status) ? <span role="status" className="text-[0.8125rem] text-ink-muted">Canceling…</span> : null}
        {retryPending(run) ? <span role="status" className="text-[0.8125rem] text-ink-muted">Retry requested…</span> : null}
        {canRetry ? (
          <Button variant="primary" busy={retry.isPending} onClick={() => retry.mutate({ id: run.id })}>
            Retry failed shards
          </Button>
        ) : null}
        {canCancel ? (
          confirming === "cancel" ? (
            <>
              <Button variant="danger" busy={cancel.isPending} onClick={() => cancel.mutate({ id: run.id }, { onSettled: () => setConfirming(null) })}>
                Confirm cancel
              </Button>
              <Button variant="quiet" onClick={() => setConfirming(null)}>
                Keep running
              </Button>
            </>
          ) : (
            <Button variant="danger" onClick={() => setConfirming("cancel")}>
              Cancel run
            </Button>
          )
        ) : null}
        {deletable ? (
          confirming === "delete" ? (
            <>
              <Button variant="danger" busy={remove.isPending} onClick={() => remove.mutate({ id: run.id }, { onSuccess: onDeleted, onSettled: () => setConfirming(null) })}>
                Confirm delete
              </Button>
              <Button variant="quiet" onClick={() => setConfirming(null)}>
                Keep it
              </Button>
            </>
          ) : (
            <Button variant="quiet" onClick={() => setConfirming("delete")}>
              Delete run
            </Button>
          )
        ) : null}
      </div>
      {error ? <ErrorBanner error={error} title="The action failed" /> : null}
    </div>
  );
}
