// Invented demo data: a crawl of the Kestrel Isles' public sites (string ids: URLs) with a small link farm around a
// "best ferry deals" page, and the citation graph of the Kestrel Review of Tidal Science (integer ids). Deterministic.

import { mulberry32 as prng } from "../workers/src/core/prng";

/** Appends ASCII lines to one growing buffer: a few hundred thousand short-lived strings instead of one long-lived array. */
class Lines {
  buf = Buffer.allocUnsafe(1 << 24);
  len = 0;
  count = 0;

  add(line: string): void {
    if (this.len + line.length * 3 + 1 > this.buf.length) {
      const bigger = Buffer.allocUnsafe(this.buf.length * 2);
      this.buf.copy(bigger, 0, 0, this.len);
      this.buf = bigger;
    }
    this.len += this.buf.write(line, this.len, "utf8");
    this.buf[this.len++] = 10;
    this.count++;
  }

  bytes(): Buffer {
    return this.buf.subarray(0, this.len);
  }
}

interface Site {
  host: string;
  pages: number;
  sections: string[];
  /** Hosts this site links to now and then. */
  partners: string[];
}

const SITES: Site[] = [
  { host: "council", pages: 34_000, sections: ["planning", "notices", "meetings", "bins", "roads", "licences", "budget", "elections"], partners: ["harbour", "ferry", "library"] },
  { host: "harbour", pages: 30_000, sections: ["moorings", "tides", "notices", "cargo", "pilots", "fees", "charts"], partners: ["ferry", "council", "weather"] },
  { host: "ferry", pages: 26_000, sections: ["timetables", "routes", "fares", "vessels", "status", "freight"], partners: ["harbour", "tourism", "weather"] },
  { host: "museum", pages: 22_000, sections: ["collections", "exhibitions", "shipwrecks", "lighthouses", "archive", "visit"], partners: ["tourism", "library", "council"] },
  { host: "tourism", pages: 38_000, sections: ["stay", "eat", "walks", "beaches", "events", "islands", "guestbook"], partners: ["ferry", "museum", "weather"] },
  { host: "library", pages: 14_000, sections: ["catalogue", "local-history", "events", "maps"], partners: ["museum", "council"] },
  { host: "weather", pages: 8_000, sections: ["forecasts", "warnings", "tides", "records"], partners: ["harbour", "ferry"] },
];

/** The page every link-farm page points at, and the trusted pages a seeded run teleports to. */
export const FARM_TARGET = "https://best-ferry-deals.example/";
export const TRUSTED_SEEDS = [
  "https://council.kestrel.example/",
  "https://council.kestrel.example/notices/",
  "https://council.kestrel.example/planning/",
  "https://harbour.kestrel.example/",
  "https://harbour.kestrel.example/notices/",
  "https://harbour.kestrel.example/tides/",
];
const FARM_HOSTS = ["cheap-crossings.example", "islandhop-offers.example", "sailaway-bargains.example"];
const FARM_PAGES = 3_000;

const home = (host: string) => `https://${host}.kestrel.example/`;
const section = (host: string, s: string) => `https://${host}.kestrel.example/${s}/`;
const page = (host: string, s: string, i: number) => `https://${host}.kestrel.example/${s}/${i}`;

/**
 * About 175 000 pages and 800 000 links, one "source,target" line each (CSV with a header). Pages link to their
 * home page and section, to older pages of their section (popular pages more often) and sometimes to a partner
 * site; section pages carry the site's navigation. The farm: throw-away pages on three spam hosts that link to the
 * deals page and to each other, the deals page linking back, and a few spam comments in the tourism guestbook.
 */
export function kestrelCrawl(seed = 20_240_611): { bytes: Buffer; links: number } {
  const rand = prng(seed);
  const pick = <T>(a: readonly T[]) => a[Math.floor(rand() * a.length)];
  const out = new Lines();
  out.add("source,target");
  const link = (a: string, b: string) => out.add(`${a},${b}`);
  for (const site of SITES) {
    const h = site.host;
    for (const s of site.sections) link(home(h), section(h, s));
    for (const p of site.partners) link(home(h), home(p));
    const perSection = Math.ceil(site.pages / site.sections.length);
    for (const s of site.sections) {
      link(section(h, s), home(h));
      for (const other of site.sections) if (other !== s) link(section(h, s), section(h, other));
      for (let i = Math.max(0, perSection - 25); i < perSection; i++) link(section(h, s), page(h, s, i));
      for (let i = 0; i < perSection; i++) {
        const me = page(h, s, i);
        link(me, home(h));
        link(me, section(h, s));
        if (i > 0) {
          const older = 1 + Math.floor(rand() * 3);
          // Squaring favours low numbers: the section's early pages collect most links.
          for (let j = 0; j < older; j++) link(me, page(h, s, Math.floor(i * rand() ** 2)));
        }
        if (rand() < 0.25) {
          const partner = SITES.find((x) => x.host === pick(site.partners));
          if (partner) link(me, rand() < 0.5 ? home(partner.host) : section(partner.host, pick(partner.sections)));
        }
      }
    }
  }
  const farm = Array.from({ length: FARM_PAGES }, (_, i) => `https://${FARM_HOSTS[i % FARM_HOSTS.length]}/deal/${i}`);
  farm.forEach((p, i) => {
    link(p, FARM_TARGET);
    if (i % 4 === 0) link(p, farm[Math.floor(rand() * farm.length)]);
  });
  for (let i = 0; i < 60; i++) link(FARM_TARGET, farm[Math.floor(rand() * farm.length)]);
  for (let i = 0; i < 4; i++) link(page("tourism", "guestbook", 100 + i * 37), FARM_TARGET);
  return { bytes: out.bytes(), links: out.count - 1 };
}

/**
 * Citations among papers of the Kestrel Review of Tidal Science, 1962–2024: "citing<TAB>cited" with a header, paper
 * ids YYYYNNNN. Each paper cites 3–25 earlier ones, mostly recent work and already well-cited papers.
 */
export function tidalCitations(seed = 19_620_301): { bytes: Buffer; papers: number; citations: number } {
  const rand = prng(seed);
  const ids: number[] = [];
  const cited: number[] = [];
  const out = new Lines();
  out.add("citing\tcited");
  for (let year = 1962; year <= 2024; year++) {
    const count = 40 + Math.floor((year - 1962) * 7 + rand() * 30);
    for (let n = 1; n <= count; n++) {
      const id = year * 10_000 + n;
      const refs = ids.length === 0 ? 0 : Math.min(ids.length, 3 + Math.floor(rand() * 23));
      const chosen = new Set<number>();
      for (let r = 0; r < refs * 3 && chosen.size < refs; r++) {
        // Half the references follow earlier citations (rich get richer), half are recent papers.
        const target = rand() < 0.5 && cited.length > 0 ? cited[Math.floor(rand() * cited.length)] : ids[Math.max(0, ids.length - 1 - Math.floor(rand() * 2_000))];
        chosen.add(target);
      }
      for (const t of chosen) {
        out.add(`${id}\t${t}`);
        cited.push(t);
      }
      ids.push(id);
    }
  }
  return { bytes: out.bytes(), papers: ids.length, citations: out.count - 1 };
}
