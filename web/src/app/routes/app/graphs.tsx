import { useQueryClient } from "@tanstack/react-query";
import { useCallback, useState } from "react";
import { useNavigate } from "react-router-dom";
import { Card } from "../../../components/ui/card";
import { Notice } from "../../../components/ui/error-banner";
import { ErrorBanner } from "../../../components/ui/error-banner";
import { PageHeader } from "../../../components/ui/page-header";
import { paths } from "../../../config/paths";
import { useSession } from "../../../lib/auth";
import { can } from "../../../lib/authorization";
import { CreateGraphForm } from "../../../features/graphs/components/create-graph-form";
import { GraphsTable } from "../../../features/graphs/components/graphs-table";
import { getUploadsQueryOptions, useUploads } from "../../../features/uploads/api/get-uploads";
import { UploadPanel } from "../../../features/uploads/components/upload-panel";

function UploadAndCreate() {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const uploads = useUploads(true);
  const [justUploaded, setJustUploaded] = useState<string | null>(null);

  const onUploaded = useCallback(
    (tusId: string) => {
      setJustUploaded(tusId);
      void queryClient.invalidateQueries({ queryKey: getUploadsQueryOptions().queryKey });
    },
    [queryClient],
  );

  const finished = uploads.data?.items.filter((u) => u.state === "complete") ?? [];
  const fresh = justUploaded ? finished.find((u) => u.tusId === justUploaded) ?? null : null;

  return (
    <div className="grid gap-5 xl:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <Card title="Upload an edge list" description="Resumable: after a dropped connection or a closed tab, add the same file again and it continues.">
        <UploadPanel limits={uploads.data?.limits ?? null} onUploaded={onUploaded} />
      </Card>
      <Card title="Create a graph" description="Choose a finished upload and how to read it; a worker validates it into a graph.">
        {uploads.isError ? <ErrorBanner error={uploads.error} title="Uploads could not be loaded" /> : null}
        {fresh ? <Notice className="mb-4">{fresh.filename} is uploaded. Name the graph and choose how to read the file.</Notice> : null}
        {finished.length ? (
          <CreateGraphForm
            key={fresh?.id ?? "any"}
            uploads={finished}
            selectedUploadId={fresh?.id ?? null}
            onCreated={(id) => navigate(paths.app.graph.getHref(id))}
          />
        ) : (
          <p className="text-[0.8125rem] text-ink-muted">{uploads.isPending ? "Loading uploads…" : "Finished uploads appear here. Drop a file on the left to begin."}</p>
        )}
      </Card>
    </div>
  );
}

export function Component() {
  const session = useSession();
  return (
    <>
      <PageHeader title="Graphs" description="Edge lists uploaded by the team and the graphs validated from them." />
      {can(session.role, "uploads:create") ? <UploadAndCreate /> : null}
      <Card title="Catalog" bodyClassName="px-4 pt-3 pb-3">
        <GraphsTable />
      </Card>
    </>
  );
}
