import { z } from "zod";
import { IdSchema } from "./common";
import { RunStatusSchema } from "./runs";

export const CompareQuerySchema = z.strictObject({
  a: z.coerce.number().int().positive(),
  b: z.coerce.number().int().positive(),
  /** Depth of the top-k overlap (default: the smaller of the two runs' top-k). */
  k: z.coerce.number().int().min(1).max(10_000).optional(),
  /** How many movers and one-sided nodes to list. */
  limit: z.coerce.number().int().min(1).max(200).default(20),
});
export type CompareQuery = z.infer<typeof CompareQuerySchema>;

export const CompareRunSchema = z.object({
  id: IdSchema,
  graph: z.object({ id: IdSchema, name: z.string() }),
  status: RunStatusSchema,
  nodes: z.number().int(),
});

export const MoverSchema = z.object({
  nodeId: z.string(),
  rankA: z.number().int(),
  rankB: z.number().int(),
  /** rankA − rankB: positive means the node moved up in b. */
  change: z.number().int(),
});
export type Mover = z.infer<typeof MoverSchema>;

export const OneSidedSchema = z.object({ nodeId: z.string(), rank: z.number().int(), score: z.number() });

/**
 * Run b against run a over the nodes both ranked. Kendall tau-b and Spearman rho (on average ranks of the scores,
 * ties shared) are null with fewer than two common nodes or a constant side. Rank-biased overlap uses p = 0.9 over
 * the two top-k prefixes (extrapolated form). Movers are common nodes in either top-k, by rank change.
 */
export const ComparisonSchema = z.object({
  a: CompareRunSchema,
  b: CompareRunSchema,
  matchedNodes: z.number().int(),
  onlyInACount: z.number().int(),
  onlyInBCount: z.number().int(),
  kendallTau: z.number().nullable(),
  spearmanRho: z.number().nullable(),
  topK: z.object({ k: z.number().int(), overlap: z.number().int(), fraction: z.number() }),
  rbo: z.object({ p: z.number(), depth: z.number().int(), value: z.number() }),
  moversUp: z.array(MoverSchema),
  moversDown: z.array(MoverSchema),
  onlyInA: z.array(OneSidedSchema),
  onlyInB: z.array(OneSidedSchema),
});
export type Comparison = z.infer<typeof ComparisonSchema>;
