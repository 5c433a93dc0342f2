/** Money is integer minor units with an ISO 4217 currency; this formats it for people. */
export function formatMoney(minor: number, currency: string, locale = "en-GB"): string {
  return new Intl.NumberFormat(locale, { style: "currency", currency }).format(minor / 100);
}
