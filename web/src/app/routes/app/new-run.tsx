import { ComingSoon } from "../../../components/ui/coming-soon";
import { PageHeader } from "../../../components/ui/page-header";

export function Component() {
  return (
    <>
      <PageHeader title="New run" description="Choose a graph and the parameters of a ranking run." />
      <ComingSoon what="Run form">
        Damping factor (default <span className="num">0.85</span>), tolerance on the L1 residual (default{" "}
        <span className="num">1e-9</span>), iteration cap (default <span className="num">200</span>), dangling policy,
        uniform or seeded teleport, edge weights, shard count and top-k size. It arrives with the run API.
      </ComingSoon>
    </>
  );
}
