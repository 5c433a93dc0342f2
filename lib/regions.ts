/**
 * The service regions a project or a reviewer can name. A configured list, not a geocoder:
 * site visits also take an optional centre point (latitude/longitude) for distances.
 */
export const REGIONS = [
  { id: "north-east", name: "North East" },
  { id: "north-west", name: "North West" },
  { id: "yorkshire", name: "Yorkshire and the Humber" },
  { id: "east-midlands", name: "East Midlands" },
  { id: "west-midlands", name: "West Midlands" },
  { id: "east", name: "East of England" },
  { id: "london", name: "London" },
  { id: "south-east", name: "South East" },
  { id: "south-west", name: "South West" },
  { id: "wales", name: "Wales" },
  { id: "scotland", name: "Scotland" },
  { id: "northern-ireland", name: "Northern Ireland" },
] as const;

export type RegionId = (typeof REGIONS)[number]["id"];

export const REGION_IDS = REGIONS.map((r) => r.id) as [RegionId, ...RegionId[]];

export function regionName(id: string): string {
  return REGIONS.find((r) => r.id === id)?.name ?? id;
}
