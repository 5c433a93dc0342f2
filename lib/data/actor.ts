/** Who is asking. Every lib/data function that reads or writes on someone's behalf takes one. */
export type Role = "homeowner" | "reviewer" | "admin";

export interface Actor {
  id: number;
  role: Role;
  /**
   * The session's version, when the actor was read from a session token alone (the board's JSON
   * route): the data function then checks it against users.session_version in its own query, so
   * a session ended by sign-out, a password reset or a suspension is refused there too.
   */
  sessionVersion?: number;
}

/** The worker and webhooks act as the system: no user, no role checks of a person. */
export const SYSTEM = { kind: "system" } as const;
export type SystemActor = typeof SYSTEM;
