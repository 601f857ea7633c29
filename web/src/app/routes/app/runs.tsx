import { Caution } from "../../../components/ui/caution";
import { ComingSoon } from "../../../components/ui/coming-soon";
import { PageHeader } from "../../../components/ui/page-header";

export function Component() {
  return (
    <>
      <PageHeader title="Runs" description="Every ranking run of this team, its state and how close it came to convergence." />
      <ComingSoon what="Run list, live convergence and results">
        Each run will show its state, iterations, L1 residual and certified error bound, the per-shard status grid,
        and once finished the top-k table and score files to download.
      </ComingSoon>
      <Caution />
    </>
  );
}
