/** Credential kinds (our names), and which are required for a reviewer to be verified. */
export const CREDENTIAL_KINDS = [
  "solar_thermal_competence",
  "unvented_hot_water_competence",
  "water_regulations_competence",
  "public_liability_insurance",
  "trade_registration",
] as const;
export type CredentialKind = (typeof CREDENTIAL_KINDS)[number];

export const CREDENTIAL_NAMES: Record<CredentialKind, string> = {
  solar_thermal_competence: "solar thermal installation competence",
  unvented_hot_water_competence: "unvented hot-water competence",
  water_regulations_competence: "water regulations competence",
  public_liability_insurance: "public liability insurance",
  trade_registration: "trade registration",
};

/** A reviewer is verified when each of these is verified and unexpired (and they are not suspended). */
export const REQUIRED_CREDENTIAL_KINDS: readonly CredentialKind[] = [
  "solar_thermal_competence",
  "water_regulations_competence",
  "public_liability_insurance",
];

export const credentialName = (kind: string) => CREDENTIAL_NAMES[kind as CredentialKind] ?? kind;
