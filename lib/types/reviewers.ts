/** Shapes shared by lib/data/reviewers.ts and the client components that show them. */

export interface ReviewerProfile {
  userId: number;
  displayName: string;
  tradingName: string;
  bio: string;
  yearsInTrade: number;
  specialisms: string[];
  region: string;
  centreLat: number | null;
  centreLng: number | null;
  travelRadiusKm: number | null;
  hourlyRateMinor: number | null;
  suspendedAt: string | null;
  suspendedReason: string | null;
}
