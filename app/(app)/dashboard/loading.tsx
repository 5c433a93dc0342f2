import { Loading } from "@/components/ui/loading";

// Only where a page never answers 403 or 404: a loading boundary sends the status (200) before
// the page has decided, so segments that can refuse have none.
export default function DashboardLoading() {
  return <Loading label="Loading your dashboard…" />;
}
