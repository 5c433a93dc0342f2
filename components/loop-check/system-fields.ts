/**
 * The fields of the system description, as data: the public loop-check form and the project's
 * stepped form both render from this list. Derived from the zod schema and its words in
 * `lib/validation/system-fields.ts`; add a field there (and to the schema), not here.
 */
export {
  SECTIONS,
  type FieldDef,
  type ListDef,
  type SectionDef,
} from "@/lib/validation/system-fields";
