import { z } from "zod";

// Zod compiles object parsers with `new Function` when it may, and finds out by trying
// `Function("")` once. Our pages' CSP allows no eval, so in the browser that probe is a CSP
// violation (caught, but reported). Parse without the compiler, on the server too, so both
// behave alike. Code shared with the browser imports `z` from here.
z.config({ jitless: true });

export { z };
