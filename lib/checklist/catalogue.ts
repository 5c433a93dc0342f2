import type { FindingKey } from "@/lib/calc/findings";
import type { System } from "@/lib/validation/system";

/**
 * The hazard catalogue the review checklist is generated from. Keys are stable: delivered
 * reports refer to them and keep CATALOGUE_VERSION. Change wording freely; change a key or
 * an `applies` rule only with a new version.
 */
export const CATALOGUE_VERSION = "2026-12.2";

export const SECTIONS = [
  "Roof and access",
  "Collector and hot zone",
  "Pressure and expansion",
  "Temperature ratings",
  "Fluid and freeze",
  "Circulation and controls",
  "Cylinder and hot-water safety",
  "Discharge and drainage",
  "Electrical and bonding",
  "Commissioning",
] as const;
export type Section = (typeof SECTIONS)[number];

export type Applies = "always" | ((system: System) => boolean);

export interface CatalogueItem {
  key: string;
  section: Section;
  applies: Applies;
  /** Plain-language label of the `applies` rule, shown to the reviewer. */
  appliesWhen: string;
  check: string;
  computed?: FindingKey;
  basis: string;
  /** What a photo should show for the reviewer to check this remotely, where a photo can. */
  photo?: string;
}

const heatSourceCount = (s: System) => new Set(s.cylinder.coils.map((c) => c.heatSource)).size;

export const CATALOGUE: readonly CatalogueItem[] = [
  {
    key: "roof-access",
    section: "Roof and access",
    applies: "always",
    appliesWhen: "always",
    check:
      "Roof work is planned from a scaffold or tower with edge protection, not from ladders alone; two people; a dry, calm day; collector kept covered until filled.",
    basis: "common practice; local work-at-height rules",
  },
  {
    key: "roof-fixing",
    section: "Roof and access",
    applies: "always",
    appliesWhen: "always",
    check:
      "Mounting rails fixed to the roof structure (not battens or tiles), rated for the site's wind and snow load; roof covering made weathertight around brackets and pipe entries.",
    basis: "EN 1991-1-3/-1-4 loads; manufacturer's instructions",
    photo: "The brackets and the roof covering around them, and where the pipes enter the roof.",
  },
  {
    key: "orientation",
    section: "Roof and access",
    applies: "always",
    appliesWhen: "always",
    check: "Azimuth and tilt give a sensible share of the best possible yield; shading noted.",
    computed: "collector-output",
    basis: "common practice",
  },
  {
    key: "hot-zone-joints",
    section: "Collector and hot zone",
    applies: "always",
    appliesWhen: "always",
    check:
      "Joints at the collector and along the steam reach are compression, press (high-temperature seals) or brazed — never soft solder, which can fail at stagnation temperature.",
    computed: "stagnation",
    basis: "common practice",
    photo: "The collector's connections with the insulation pulled back.",
  },
  {
    key: "hot-zone-insulation",
    section: "Collector and hot zone",
    applies: "always",
    appliesWhen: "always",
    check:
      "Insulation along the steam reach is rated above the steam's temperature, and at the collector's connections above the stagnation temperature; outdoors it is UV- and bird-resistant. Ordinary foam lagging melts.",
    computed: "stagnation",
    basis: "common practice",
    photo:
      "The pipe insulation at the collector and where the pipes enter the roof, with any label.",
  },
  {
    key: "sensor",
    section: "Collector and hot zone",
    applies: "always",
    appliesWhen: "always",
    check:
      "Collector sensor sits in the collector's sensor pocket at the flow outlet, with cable rated for the heat; cylinder sensor near the solar coil.",
    basis: "common practice",
  },
  {
    key: "high-point-vent",
    section: "Collector and hot zone",
    applies: (s) => s.collectors.highPointVent !== "none",
    appliesWhen: "a vent is fitted at the high point",
    check:
      "Any vent at the high point is a manual or isolatable high-temperature vent, closed after commissioning so steam cannot escape.",
    computed: "stagnation",
    basis: "common practice",
    photo: "The vent at the top of the loop and its isolating valve.",
  },
  {
    key: "steam-reach",
    section: "Collector and hot zone",
    applies: "always",
    appliesWhen: "always",
    check:
      "The computed steam reach at stagnation stops short of the pump station and the expansion vessel; where it does not, a stagnation cooler or an intermediate vessel sized for the displaced volume is fitted before the station.",
    computed: "steam-reach",
    basis: "VDI 6002-1",
    photo:
      "The pipe route from the collector to the pump station, and any cooler or intermediate vessel on it.",
  },
  {
    key: "vessel-rating",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "The expansion vessel is made for solar loops: its diaphragm temperature rating and maximum pressure are at or above what it will see.",
    computed: "vessel-rating",
    basis: "EN 13831 (vessels); common practice",
    photo: "The vessel's label, showing its volume, maximum pressure and temperature.",
  },
  {
    key: "vessel-size",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "Nominal volume at or above the computed requirement, which includes the steam volume at stagnation.",
    computed: "vessel-size",
    basis: "VDI 6002-1; EN 12977-1",
  },
  {
    key: "vessel-precharge",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check: "Pre-charge set to the computed value with the vessel empty of fluid, before filling.",
    computed: "vessel-precharge",
    basis: "VDI 6002-1",
  },
  {
    key: "vessel-cooling",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "The vessel hangs below its connection on an uninsulated leg, with an intermediate cooling vessel where the steam reach passes the pump station, so the diaphragm never sees steam.",
    computed: "vessel-rating",
    basis: "VDI 6002-1; common practice",
    photo: "The vessel and the pipe from the pump station down to it.",
  },
  {
    key: "vessel-isolation",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check: "The vessel's service valve cannot be closed by accident (capped or lockable).",
    basis: "common practice",
  },
  {
    key: "relief-valve",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "A relief valve protects the loop with no valve that can isolate it from the collector; its setting is at or below every component's maximum pressure, and stagnation stays below the final design pressure, where relief valves start to weep.",
    computed: "relief-margin",
    basis: "EN 12977-1; EN 12828 (principle)",
    photo: "The relief valve, its set-pressure marking and its discharge pipe.",
  },
  {
    key: "return-side",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "The check valve and the expansion vessel's connection are on the return side, and no valve can shut the collector off from the expansion vessel and the relief valve (any valve between them is capped or locked open).",
    basis: "EN 12977-1; EN 12828 (principle); common practice",
    photo:
      "The pump station from the front, showing every valve, the check valve and the vessel connection.",
  },
  {
    key: "relief-temperature",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "The relief valve is made for solar loops and rated for the temperature it may see at the pump station, which at stagnation can pass 120 °C.",
    computed: "relief-margin",
    basis: "common practice",
    photo: "The relief valve's body, showing its pressure and temperature markings.",
  },
  {
    key: "fill-pressure",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check: "Cold fill pressure is the computed value; a gauge is readable.",
    computed: "fill-pressure",
    basis: "VDI 6002-1",
  },
  {
    key: "night-pressure",
    section: "Pressure and expansion",
    applies: "always",
    appliesWhen: "always",
    check:
      "On a cold night the pressure at the collector's top stays above the computed minimum: the gauge read at dawn in winter matches the cold-night figure, and no air is drawn in at the top.",
    computed: "fill-pressure",
    basis: "VDI 6002-1; common practice",
    photo: "The pressure gauge, read cold early on a winter morning.",
  },
  {
    key: "pump-rating",
    section: "Temperature ratings",
    applies: "always",
    appliesWhen: "always",
    check:
      "The circulator is rated for solar primary temperatures and sits on the cooler return leg.",
    computed: "component-ratings",
    basis: "common practice",
    photo: "The circulator's data plate.",
  },
  {
    key: "component-ratings",
    section: "Temperature ratings",
    applies: "always",
    appliesWhen: "always",
    check:
      "Every valve, meter, separator and seal in the loop is rated for the loop's highest temperature and pressure at its location.",
    computed: "component-ratings",
    basis: "common practice",
  },
  {
    key: "check-valve",
    section: "Temperature ratings",
    applies: "always",
    appliesWhen: "always",
    check:
      "A check valve (or equivalent) stops reverse circulation at night that would cool the cylinder.",
    basis: "common practice",
  },
  {
    key: "fluid-type",
    section: "Fluid and freeze",
    applies: "always",
    appliesWhen: "always",
    check:
      "The fluid is a solar heat-transfer fluid (inhibited propylene glycol rated for stagnation), not automotive antifreeze and not plain water in a frost-exposed loop, and at least about 25 % glycol so its inhibitors protect.",
    computed: "fluid",
    basis: "common practice",
    photo: "The fluid's container label.",
  },
  {
    key: "freeze",
    section: "Fluid and freeze",
    applies: "always",
    appliesWhen: "always",
    check:
      "The mix starts to freeze at least 5 K below the site's design minimum, since a collector under a clear night sky runs colder than the air.",
    computed: "freeze",
    basis: "Melinder (2010) property data; common practice (clear-sky margin)",
  },
  {
    key: "fluid-testing",
    section: "Fluid and freeze",
    applies: "always",
    appliesWhen: "always",
    check:
      "The fluid is tested at every service and after any stagnation: freezing point with a refractometer and pH with strips or a meter; it is replaced when it has turned acidic or dark.",
    computed: "fluid",
    basis: "common practice",
  },
  {
    key: "fluid-volume",
    section: "Fluid and freeze",
    applies: "always",
    appliesWhen: "always",
    check: "Enough fluid is on hand for the computed volume plus a margin for flushing.",
    computed: "fluid-volume",
    basis: "common practice",
  },
  {
    key: "flow-rate",
    section: "Circulation and controls",
    applies: "always",
    appliesWhen: "always",
    check: "Flow rate suits the collector area and the flow meter's range covers it.",
    computed: "flow-rate",
    basis: "common practice (specific flow ranges)",
  },
  {
    key: "pipe-sizing",
    section: "Circulation and controls",
    applies: "always",
    appliesWhen: "always",
    check: "Tube size gives a velocity in range and a pressure drop the pump can deliver.",
    computed: "hydraulics",
    basis: "Darcy–Weisbach; EN 1057 tube sizes",
  },
  {
    key: "air-separation",
    section: "Circulation and controls",
    applies: "always",
    appliesWhen: "always",
    check:
      "An air separator rated for the loop's temperatures is in the flow line; the loop can be purged of air when filling.",
    computed: "component-ratings",
    basis: "common practice",
    photo: "The pump station's flow side with the air separator.",
  },
  {
    key: "pipe-insulation",
    section: "Circulation and controls",
    applies: "always",
    appliesWhen: "always",
    check:
      "The pipes are insulated along their length (UV-resistant outdoors, rated for steam near the collector), except a deliberate cooling leg.",
    computed: "pipe-insulation",
    basis: "common practice",
    photo: "The pipe runs in the roof space and outdoors.",
  },
  {
    key: "controller",
    section: "Circulation and controls",
    applies: "always",
    appliesWhen: "always",
    check:
      "A differential controller with overheat protection drives the pump; sensors placed as above.",
    basis: "common practice",
  },
  {
    key: "coil-connection",
    section: "Cylinder and hot-water safety",
    applies: "always",
    appliesWhen: "always",
    check:
      "The solar coil is the lowest coil; the hot flow enters at the top of the coil and returns from the bottom.",
    computed: "coil-position",
    basis: "common practice",
    photo: "The cylinder's connections with their labels.",
  },
  {
    key: "heat-trap",
    section: "Cylinder and hot-water safety",
    applies: "always",
    appliesWhen: "always",
    check:
      "The cylinder's solar flow and return and its hot outlet have heat traps (the pipe drops or loops down before it connects), so that circulation inside a single pipe does not cool the store at night.",
    basis: "common practice",
    photo: "The pipes at the cylinder's connections.",
  },
  {
    key: "store-size",
    section: "Cylinder and hot-water safety",
    applies: "always",
    appliesWhen: "always",
    check:
      "The cylinder's volume suits the collector area (about 40 L per m² or more), or frequent stagnation is planned for (a heat dump or a holiday setting on the controller).",
    computed: "store-size",
    basis: "common practice",
  },
  {
    key: "unvented",
    section: "Cylinder and hot-water safety",
    applies: (s) => s.cylinder.type === "unvented",
    appliesWhen: "the cylinder is unvented",
    check:
      "The cylinder's own temperature and pressure relief valve, expansion relief, expansion vessel and discharge pipework are in place, separate from the solar loop's, and fitted by a person competent under local rules.",
    computed: "unvented",
    basis: "local building rules",
    photo: "The cylinder's data label, its relief valves and the discharge pipe with its tundish.",
  },
  {
    key: "unvented-cutout",
    section: "Cylinder and hot-water safety",
    applies: (s) => s.cylinder.type === "unvented",
    appliesWhen: "the cylinder is unvented",
    check:
      "Where local rules require one, the solar loop feeding the unvented cylinder has a high-temperature cut-out that works without the controller (an overheat thermostat that stops the solar pump or closes a motorised valve).",
    computed: "unvented",
    basis: "local building rules (e.g. Approved Document G in England)",
    photo:
      "The cylinder's label and any overheat thermostat or motorised valve on the solar pipes.",
  },
  {
    key: "scald",
    section: "Cylinder and hot-water safety",
    applies: "always",
    appliesWhen: "always",
    check:
      "A thermostatic mixing valve limits hot water at the outlets, since solar can drive the store above 80 °C, and is set to a safe outlet temperature (for example 48 °C at a bath in new homes in England; local rules decide).",
    computed: "scald",
    basis: "local rules (e.g. Approved Document G); common practice",
    photo: "The mixing valve and its setting.",
  },
  {
    key: "legionella",
    section: "Cylinder and hot-water safety",
    applies: "always",
    appliesWhen: "always",
    check:
      "The whole store reaches at least 60 °C regularly through a backup heat source or a controller cycle.",
    basis: "WHO guidelines for drinking-water quality (Legionella)",
  },
  {
    key: "other-sources",
    section: "Cylinder and hot-water safety",
    applies: (s) => heatSourceCount(s) > 1,
    appliesWhen: "more than one heat source feeds the cylinder",
    check:
      "Other heat sources (boiler coil, stove coil) are controlled so that none overheats the store; a solid-fuel loop has its own heat dump.",
    basis: "common practice",
  },
  {
    key: "relief-discharge",
    section: "Discharge and drainage",
    applies: "always",
    appliesWhen: "always",
    check:
      "Relief discharge from the primary loop runs to a container that can take hot glycol, where it is seen; glycol is not sent to drain.",
    basis: "common practice",
    photo: "The end of the relief discharge pipe and its container.",
  },
  {
    key: "fill-drain",
    section: "Discharge and drainage",
    applies: "always",
    appliesWhen: "always",
    check:
      "Fill and drain points are capped; the loop is filled with the solar fluid by a filling pump that drives the air out, not from the mains.",
    basis: "common practice",
  },
  {
    key: "bonding",
    section: "Electrical and bonding",
    applies: "always",
    appliesWhen: "always",
    check: "Metal pipework is bonded as local wiring rules require.",
    basis: "local wiring rules",
  },
  {
    key: "pressure-test",
    section: "Commissioning",
    applies: "always",
    appliesWhen: "always",
    check:
      "The loop is pressure tested with the solar fluid itself, not with water first: water left in collectors that cannot be drained freezes or dilutes the glycol. The result is recorded.",
    basis: "EN 12976-2 / EN 12977 test principles; common practice",
  },
  {
    key: "first-run",
    section: "Commissioning",
    applies: "always",
    appliesWhen: "always",
    check:
      "On first run: flow seen on the meter, temperature difference sensible, hot and cold pressures recorded against the design.",
    computed: "first-fill",
    basis: "common practice",
  },
];
