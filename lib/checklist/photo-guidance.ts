/**
 * Which photos let a reviewer judge each checklist item, as data keyed by the catalogue's item
 * keys (lib/checklist/catalogue.ts). Items that are judged from the description and the loop
 * check alone have no entry. `areas` are the photo tags (lib/validation/request.ts PHOTO_TAGS)
 * whose photos are likely to show the item, so the reviewer sees them beside it even before the
 * homeowner tags a photo to the item itself. `fromRoof` marks photos taken at the collector: the
 * project page shows the roof-safety caution beside them.
 *
 * The advice is common practice for a remote design check, not a published list.
 */
import type { PHOTO_TAGS } from "@/lib/validation/request";

export type PhotoArea = (typeof PHOTO_TAGS)[number];

export interface PhotoGuidance {
  /** One line: what to photograph, so the reviewer can judge the item. */
  photo: string;
  areas: readonly PhotoArea[];
  fromRoof?: boolean;
}

export const PHOTO_GUIDANCE: Readonly<Record<string, PhotoGuidance>> = {
  "roof-access": {
    photo:
      "The roof and the way up to it, from the ground or a window: where a scaffold or tower would stand.",
    areas: ["roof"],
  },
  "roof-fixing": {
    photo:
      "The mounting kit and its roof hooks or brackets, and the rafters in the loft where they will fix.",
    areas: ["roof", "collector"],
    fromRoof: true,
  },
  orientation: {
    photo:
      "The roof slope from the ground, showing any trees, chimneys or buildings that shade it.",
    areas: ["roof"],
  },
  "hot-zone-joints": {
    photo: "The fittings you will use at the collector and on the first metre of flow pipe.",
    areas: ["collector", "pipework"],
    fromRoof: true,
  },
  "hot-zone-insulation": {
    photo: "The insulation for the collector pipes, with its printed temperature rating.",
    areas: ["pipework", "collector"],
  },
  sensor: {
    photo: "The collector's sensor pocket and the sensor with its cable label.",
    areas: ["collector"],
    fromRoof: true,
  },
  "high-point-vent": {
    photo: "The vent for the high point, with its markings or box.",
    areas: ["collector", "pipework"],
  },
  "steam-reach": {
    photo:
      "The pipe route from the collector to the pump station, with any cooler or intermediate vessel on it.",
    areas: ["pipework", "pump_station"],
  },
  "vessel-rating": {
    photo: "The expansion vessel's rating plate (volume, maximum pressure, diaphragm temperature).",
    areas: ["vessel"],
  },
  "vessel-size": {
    photo: "The expansion vessel's rating plate showing its nominal volume.",
    areas: ["vessel"],
  },
  "vessel-precharge": {
    photo:
      "The vessel's pre-charge gauge reading, or a tyre gauge on its valve, with the vessel empty.",
    areas: ["vessel"],
  },
  "vessel-cooling": {
    photo: "Where the vessel will hang and the pipe leg to it.",
    areas: ["vessel", "pump_station"],
  },
  "vessel-isolation": {
    photo: "The vessel's service valve and its cap or lock.",
    areas: ["vessel"],
  },
  "relief-valve": {
    photo: "The relief valve with its marked setting, and the pipe between it and the collector.",
    areas: ["pump_station"],
  },
  "fill-pressure": {
    photo: "The pump station's pressure gauge, readable.",
    areas: ["pump_station"],
  },
  "return-side": {
    photo:
      "The pump station from the front: every valve, the check valve and where the vessel connects.",
    areas: ["pump_station", "vessel"],
  },
  "relief-temperature": {
    photo: "The relief valve's body, with its pressure and temperature markings readable.",
    areas: ["pump_station"],
  },
  "night-pressure": {
    photo: "The pump station's pressure gauge, read cold early on a winter morning.",
    areas: ["pump_station"],
  },
  "pump-rating": {
    photo: "The circulator's label (temperature class) and which leg it sits on.",
    areas: ["pump_station"],
  },
  "component-ratings": {
    photo: "The labels of the valves, flow meter and air separator in the loop.",
    areas: ["pump_station", "pipework"],
  },
  "check-valve": {
    photo: "The check valve in the pump station (often inside a ball valve, marked with an arrow).",
    areas: ["pump_station"],
  },
  "fluid-type": {
    photo: "The heat-transfer fluid's container label (type, mix, temperature rating).",
    areas: ["other"],
  },
  freeze: {
    photo: "The fluid's label showing its freeze protection or mixing table.",
    areas: ["other"],
  },
  "flow-rate": {
    photo: "The flow meter on the pump station with its scale.",
    areas: ["pump_station"],
  },
  "pipe-sizing": {
    photo: "The pipe you will use, with the size printed on it.",
    areas: ["pipework"],
  },
  "air-separation": {
    photo: "The air separator and its rating label.",
    areas: ["pump_station", "pipework"],
  },
  "pipe-insulation": {
    photo: "The pipe runs in the roof space and outdoors, with the insulation and its label.",
    areas: ["pipework"],
    fromRoof: true,
  },
  controller: {
    photo: "The controller's label and the screen or manual page for its overheat setting.",
    areas: ["pump_station"],
  },
  "coil-connection": {
    photo: "The cylinder's label and its coil connections, so the solar coil can be identified.",
    areas: ["cylinder"],
  },
  "heat-trap": {
    photo:
      "The pipes at the cylinder's solar connections, showing whether they drop before rising.",
    areas: ["cylinder"],
  },
  unvented: {
    photo:
      "The unvented cylinder's safety kit: the relief valves, the tundish and the discharge pipe.",
    areas: ["cylinder"],
  },
  "unvented-cutout": {
    photo:
      "The cylinder's label and any overheat thermostat or motorised valve on the solar pipes.",
    areas: ["cylinder"],
  },
  scald: {
    photo: "The thermostatic mixing valve at the cylinder outlet, or where it will go.",
    areas: ["cylinder"],
  },
  "other-sources": {
    photo: "Each other heat source's connection to the cylinder and its controls.",
    areas: ["cylinder"],
  },
  "relief-discharge": {
    photo: "Where the relief valve's discharge pipe will end and the container it runs to.",
    areas: ["pump_station"],
  },
  "fill-drain": {
    photo: "The fill and drain valves on the pump station, with their caps.",
    areas: ["pump_station"],
  },
  bonding: {
    photo: "The earth bonding clamps on the metal pipework near the cylinder.",
    areas: ["cylinder", "pipework"],
  },
};

/** The guidance for one item, or null when the item needs no photo. */
export function photoGuidanceFor(key: string): PhotoGuidance | null {
  return PHOTO_GUIDANCE[key] ?? null;
}

/** Take roof photos only from a safe place: shown beside every item that is photographed at the collector. */
export const ROOF_PHOTO_CAUTION =
  "Take roof and collector photos only from the ground, a window, the loft or a scaffold with edge protection — never from a ladder on the roof or by walking on it. Photos of the parts before they go up are just as useful.";
