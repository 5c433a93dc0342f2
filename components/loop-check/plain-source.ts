/**
 * Sources as homeowners read them: the standard's name, without the provenance notes kept for
 * the code and the tests ("from memory", "coefficients from memory"). The full text stays in
 * lib/calc and behind the "How this is worked out" disclosure's note.
 */
export function plainSource(text: string): string {
  return text
    .replace(/\s*\((?:coefficients |recalled |values )?from memory[^()]*\)/gi, "")
    .replace(/[,;]\s*(?:recalled |coefficients )?from memory(?: of [^,;.)]*)?/gi, "")
    .replace(/\s{2,}/g, " ")
    .trim();
}

/** True when the text carries a provenance note that plainSource takes out. */
export function hasRecalledFigures(text: string): boolean {
  return /from memory/i.test(text);
}
