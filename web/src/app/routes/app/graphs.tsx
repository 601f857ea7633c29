import { ComingSoon } from "../../../components/ui/coming-soon";
import { PageHeader } from "../../../components/ui/page-header";

export function Component() {
  return (
    <>
      <PageHeader title="Graphs" description="Edge lists uploaded by the team and the graphs validated from them." />
      <ComingSoon what="Graph catalog, resumable upload and validation reports">
        Upload a CSV, TSV or whitespace-separated edge list (optionally gzip-compressed); a worker validates it into a
        graph and reports rows read, nodes, edges, self-loops, duplicates, dangling nodes and the first bad lines.
      </ComingSoon>
    </>
  );
}
