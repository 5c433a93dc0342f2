import { config } from "zod";

// Zod compiles object parsers with `new Function` when it may, and finds out by trying
// `Function("")` once. Our pages' CSP allows no eval, so in the browser that probe is a CSP
// violation (caught, but reported). Parse without the compiler, on the server too, so both
// behave alike. Code shared with the browser imports `z` from here.
config({ jitless: true });

// A namespace re-export rather than zod's `z` object, so the bundler keeps only what the
// browser's code uses (zod's `z` object carries every locale and the JSON-schema converter).
export * as z from "zod";
