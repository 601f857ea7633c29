// Graph names are shown to the whole team: control characters and invisible text-direction characters (which can make
// a name display as something else) are refused with a 400 that names the field and the code point; surrounding
// whitespace is trimmed; ordinary text in any script is kept as typed.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ErrorBodySchema } from "../../api/contracts/common";
import { CreateGraphSchema } from "../../api/contracts/graphs";
import type { RunningServer } from "../../api/src/server";
import { tokenClient, tusUpload } from "./portal-support";
import { createTestTeam, startTestServer, type ApiClient } from "./support";

interface Issue {
  path: string[];
  message: string;
  params?: { codePoint: string; position: number };
}

const REFUSED: Array<[string, number]> = [
  ["left-to-right embedding", 0x202a],
  ["right-to-left embedding", 0x202b],
  ["pop directional formatting", 0x202c],
  ["left-to-right override", 0x202d],
  ["right-to-left override", 0x202e],
  ["left-to-right isolate", 0x2066],
  ["right-to-left isolate", 0x2067],
  ["first strong isolate", 0x2068],
  ["pop directional isolate", 0x2069],
  ["left-to-right mark", 0x200e],
  ["right-to-left mark", 0x200f],
  ["arabic letter mark", 0x061c],
  ["a control character", 0x00],
  ["a control character", 0x07],
  ["a control character", 0x09],
  ["a control character", 0x0a],
  ["a control character", 0x1b],
  ["a control character", 0x7f],
  ["a control character", 0x85],
];

const hex = (cp: number) => `U+${cp.toString(16).toUpperCase().padStart(4, "0")}`;

describe("graph names", () => {
  let server: RunningServer;
  let api: ApiClient;
  let uploadId: number;

  beforeAll(async () => {
    server = await startTestServer();
    const team = await createTestTeam(server, "names");
    api = await tokenClient(server, team.email.engineer);
    uploadId = (await tusUpload(server, { bearer: api.bearer }, Buffer.from("1,2\n2,3\n3,1\n"), "ferry-links.csv")).uploadId;
  });
  afterAll(() => server.close());

  it.each(REFUSED.map(([kind, cp]) => [hex(cp), kind, cp] as const))("%s (%s) inside a name → 400 naming the field and the code point", async (label, kind, cp) => {
    const name = `Ferry ${String.fromCodePoint(cp)}deals`;
    const res = await api.post("/api/graphs", { uploadId, name });
    expect(res.status).toBe(400);
    const { error } = ErrorBodySchema.parse(res.body);
    expect(error.code).toBe("validation_failed");
    expect(error.message).toContain("name:");
    expect(error.message).toContain(label);
    const issues = (error.details as { issues: Issue[] }).issues;
    expect(issues).toHaveLength(1);
    expect(issues[0].path).toEqual(["name"]);
    expect(issues[0].message).toContain(`${label} (${kind}) at character 7`);
    expect(issues[0].params).toEqual({ codePoint: label, position: 7 });
  });

  it("counts the position in characters, not UTF-16 units", async () => {
    const res = await api.post("/api/graphs", { uploadId, name: "🌊🌊 tide\u2067" });
    expect(res.status).toBe(400);
    const issues = (ErrorBodySchema.parse(res.body).error.details as { issues: Issue[] }).issues;
    expect(issues[0].params).toEqual({ codePoint: "U+2067", position: 8 });
  });

  it("trims surrounding whitespace (tabs and new lines included) and keeps names in any script", async () => {
    const cases: Array<[string, string]> = [
      ["  Kestrel harbour crawl \t\n", "Kestrel harbour crawl"],
      ["Gezeitenbericht – Kestrel ☂", "Gezeitenbericht – Kestrel ☂"],
      ["مرفأ كيستريل", "مرفأ كيستريل"],
      ["ケストレル諸島 🌊", "ケストレル諸島 🌊"],
    ];
    for (const [typed, stored] of cases) {
      const created = await api.post<{ id: number }>("/api/graphs", { uploadId, name: typed });
      expect(created.status, typed).toBe(202);
      const graph = await api.get<{ name: string }>(`/api/graphs/${created.body.id}`);
      expect(graph.body.name).toBe(stored);
    }
  });

  it("still refuses an empty name after trimming, and the web form's schema gives the same message", async () => {
    const blank = await api.post("/api/graphs", { uploadId, name: " \t " });
    expect(blank.status).toBe(400);
    const parsed = CreateGraphSchema.safeParse({ uploadId, name: "Ferry\u202edeals" });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0].message).toMatch(/^The graph name contains U\+202E \(right-to-left override\) at character 6/);
  });
});
