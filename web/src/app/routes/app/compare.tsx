import { ComingSoon } from "../../../components/ui/coming-soon";
import { PageHeader } from "../../../components/ui/page-header";

export function Component() {
  return (
    <>
      <PageHeader title="Compare" description="How two rankings of the same nodes differ." />
      <ComingSoon what="Run comparison">
        Pick two finished runs to see Kendall tau and Spearman rho over their common nodes, the overlap of their top-k,
        the biggest movers up and down, and the nodes that appeared or disappeared.
      </ComingSoon>
    </>
  );
}
