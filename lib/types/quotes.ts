/** Shapes shared by lib/data/quotes.ts and the client components that show them. */

export interface QuoteForHomeowner {
  id: number;
  reviewerId: number;
  tradingName: string;
  yearsInTrade: number;
  priceMinor: number;
  currency: string;
  turnaroundDays: number;
  scopeMd: string;
  proposedVisitDate: string | null;
  status: string;
  /** The reviewer's average rating (1–5, one decimal) and how many ratings it is from. */
  rating: number | null;
  ratingCount: number;
  /** From the reviewer's centre to the site, when both are known. */
  distanceKm: number | null;
}
