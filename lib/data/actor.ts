/** Who is asking. Every lib/data function that reads or writes on someone's behalf takes one. */
export type Role = "homeowner" | "reviewer" | "admin";

export interface Actor {
  id: number;
  role: Role;
}

/** The worker and webhooks act as the system: no user, no role checks of a person. */
export const SYSTEM = { kind: "system" } as const;
export type SystemActor = typeof SYSTEM;
