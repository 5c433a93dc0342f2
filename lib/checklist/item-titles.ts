/**
 * A short title per checklist item key, for lists, progress, messages and the report (the
 * catalogue's `check` text is the full instruction). Kept beside the catalogue rather than in it,
 * so the catalogue's version only moves when a key or an `applies` rule changes.
 */
export const ITEM_TITLES: Readonly<Record<string, string>> = {
  "roof-access": "Safe roof access",
  "steam-reach": "Steam kept from the pump station and vessel",
  "return-side": "Check valve and vessel on the return",
  "relief-temperature": "Relief valve temperature rating",
  "night-pressure": "Collector-top pressure on a cold night",
  "fluid-testing": "Fluid tested at service",
  "pipe-insulation": "Pipe insulation",
  "heat-trap": "Heat traps at the cylinder",
  "store-size": "Cylinder size for the collector area",
  "unvented-cutout": "High-temperature cut-out for an unvented cylinder",
  "roof-fixing": "Collector fixing and weathering",
  orientation: "Orientation and shading",
  "hot-zone-joints": "Joints near the collector",
  "hot-zone-insulation": "Insulation near the collector",
  sensor: "Collector and cylinder sensors",
  "high-point-vent": "High-point vent",
  "vessel-rating": "Expansion vessel rating",
  "vessel-size": "Expansion vessel size",
  "vessel-precharge": "Vessel pre-charge",
  "vessel-cooling": "Vessel kept from steam",
  "vessel-isolation": "Vessel service valve",
  "relief-valve": "Relief valve",
  "fill-pressure": "Fill pressure and gauge",
  "pump-rating": "Circulator rating and position",
  "component-ratings": "Component ratings",
  "check-valve": "Check valve",
  "fluid-type": "Heat-transfer fluid",
  freeze: "Freeze protection",
  "fluid-volume": "Fluid on hand",
  "flow-rate": "Flow rate and flow meter",
  "pipe-sizing": "Pipe sizing",
  "air-separation": "Air separation and purging",
  controller: "Differential controller",
  "coil-connection": "Solar coil connection",
  unvented: "Unvented cylinder safety",
  scald: "Scald protection",
  legionella: "Legionella control",
  "other-sources": "Other heat sources",
  "relief-discharge": "Relief discharge",
  "fill-drain": "Fill and drain points",
  bonding: "Bonding",
  "pressure-test": "Pressure test",
  "first-run": "First run",
};

/** The item's title; an unknown key is shown as words rather than as the key. */
export function itemTitle(key: string): string {
  const known = ITEM_TITLES[key];
  if (known) return known;
  const words = key.replace(/[-_]+/g, " ").trim();
  return words ? words[0]!.toUpperCase() + words.slice(1) : "Checklist item";
}
