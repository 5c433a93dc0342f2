import type { Db } from "./db";

/**
 * One job with the rows every job page, e-mail and receipt reads beside it: its request (`q`),
 * project (`p`), homeowner (`h`), reviewer (`v`) and the reviewer's profile (`rp`, which may be
 * missing). Callers add their own columns with `.first(...)`.
 */
export function jobWithPeople(db: Db, jobId: number) {
  return db("jobs as j")
    .join("requests as q", "q.id", "j.request_id")
    .join("projects as p", "p.id", "q.project_id")
    .join("users as h", "h.id", "j.homeowner_id")
    .join("users as v", "v.id", "j.reviewer_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "j.reviewer_id")
    .where("j.id", jobId);
}
