// Teams with real objects for the isolation and input tests: an upload, a ready graph and a converged run each,
// made through the API with one in-process runner serving exactly these teams.
import { GraphDetailSchema } from "../../api/contracts/graphs";
import { RunDetailSchema } from "../../api/contracts/runs";
import type { RunningServer } from "../../api/src/server";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { tokenClient, tusUpload, waitFor } from "./portal-support";
import { randomEdgeList, runnerConfig } from "./runner-support";
import { createTestTeam, type ApiClient, type TestTeam } from "./support";

export interface SeededTeam {
  team: TestTeam;
  /** The team's engineer, by API token. */
  api: ApiClient;
  uploadId: number;
  tusId: string;
  graphId: number;
  runId: number;
}

/** Nodes of every seeded graph (integer ids); node 1 always exists, 999999 never does. */
export const SEEDED_NODES = 60;

export async function createTeams(server: RunningServer, labels: readonly string[]): Promise<TestTeam[]> {
  const teams: TestTeam[] = [];
  for (const label of labels) teams.push(await createTestTeam(server, label));
  return teams;
}

export function runnerFor(dataDir: string, teams: readonly TestTeam[]): Promise<Runner> {
  return startRunner(runnerConfig(dataDir, teams[0].teamId, { teams: teams.map((t) => t.teamId) }));
}

export interface SeedOptions {
  /** Edge list text; default: a random integer graph of SEEDED_NODES nodes. */
  edges?: string;
  graphName?: string;
  filename?: string;
  seed?: number;
}

/** Upload, ingest and rank a small graph for the team; the runner must serve the team. */
export async function seedTeam(server: RunningServer, team: TestTeam, options: SeedOptions = {}): Promise<SeededTeam> {
  const seed = options.seed ?? 7;
  const api = await tokenClient(server, team.email.engineer);
  const edges = options.edges ?? randomEdgeList(SEEDED_NODES, seed);
  const upload = await tusUpload(server, { bearer: api.bearer }, Buffer.from(edges), options.filename ?? "kestrel-harbour-links.txt");
  const graph = await api.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: options.graphName ?? `Harbour links ${seed}` });
  if (graph.status !== 202) throw new Error(`graph creation failed: ${graph.status} ${JSON.stringify(graph.body)}`);
  const ready = await waitFor("the seeded graph", async () => {
    const detail = GraphDetailSchema.parse((await api.get(`/api/graphs/${graph.body.id}`)).body);
    return detail.status === "ready" || detail.status === "rejected" ? detail : null;
  });
  if (ready.status !== "ready") throw new Error(`the seeded graph was rejected: ${JSON.stringify(ready.rejection)}`);
  const run = await api.post<{ id: number }>("/api/runs", { graphId: graph.body.id, topK: 10 });
  if (run.status !== 202) throw new Error(`run submission failed: ${run.status} ${JSON.stringify(run.body)}`);
  const done = await waitFor("the seeded run", async () => {
    const detail = RunDetailSchema.parse((await api.get(`/api/runs/${run.body.id}`)).body);
    return ["queued", "running"].includes(detail.status) ? null : detail;
  });
  if (done.status !== "converged") throw new Error(`the seeded run ended ${done.status}: ${done.statusReason}`);
  return { team, api, uploadId: upload.uploadId, tusId: upload.tusId, graphId: graph.body.id, runId: run.body.id };
}
