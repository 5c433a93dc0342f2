import { ClipboardCheck, Gauge, ShieldCheck } from "lucide-react";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";

const ROLES = [
  {
    icon: Gauge,
    cta: { href: "/sign-up", label: "Describe your loop" },
    who: "Homeowners",
    lead: "Fitting your own solar hot-water loop?",
    points: [
      "Describe the system step by step, with a sketch and photos.",
      "Get an instant loop check: fluid volume, vessel size and pre-charge, fill pressure, freeze protection, flow and stagnation temperatures.",
      "Buy a remote design check or a site visit. Your payment is held and released only when the report is delivered.",
    ],
  },
  {
    icon: ClipboardCheck,
    cta: { href: "/sign-up?as=reviewer", label: "Become a reviewer" },
    who: "Plumbers and heating engineers",
    lead: "Solar-competent? Take paid remote design checks and site visits between jobs.",
    points: [
      "Browse open requests by kind, region and collector type, and quote your price and turnaround.",
      "Work through a checklist of solar-specific hazards with the computed evidence beside each item.",
      "Deliver the report and get paid out from held funds to your payout account.",
    ],
  },
  {
    icon: ShieldCheck,
    cta: { href: "/sign-in", label: "Sign in" },
    who: "Admins",
    lead: "Keep the register honest.",
    points: [
      "Verify trade credentials and insurance, with reasons and expiry dates.",
      "Suspend reviewers when needed and settle disputes: release, partial or full refund.",
      "See the ledger of every payment, payout and refund.",
    ],
  },
] as const;

export default function LandingPage() {
  return (
    <div className="space-y-12">
      <section className="grid gap-8 md:grid-cols-[3fr_2fr] md:items-center">
        <div className="space-y-5">
          <h1 className="text-4xl font-bold leading-tight text-slate-900 md:text-5xl">
            Get your solar loop checked <span className="text-copper-600">before it is filled</span>
            .
          </h1>
          <p className="text-lg text-slate-700">
            A solar primary loop is not ordinary plumbing. A collector that stops circulating in
            full sun can pass 200 °C; the loop is pressurised and needs room for steam, a relief
            valve, a check valve, air separation and the right glycol mix. Loopwright checks the
            numbers for free and connects you with a verified, solar-competent tradesperson for a
            remote design check or a site visit.
          </p>
          <div className="flex flex-wrap gap-3">
            <ButtonLink href="/loop-check">Try the loop check</ButtonLink>
            <ButtonLink href="/sign-up" variant="secondary">
              Describe your loop
            </ButtonLink>
            <ButtonLink href="/sign-up?as=reviewer" variant="ghost">
              Plumber? Become a reviewer
            </ButtonLink>
          </div>
        </div>
        <Card className="border-copper-200 bg-copper-50">
          <h2 className="text-lg font-bold">What the loop check works out</h2>
          <ul className="mt-3 list-disc space-y-1 pl-5 text-slate-800">
            <li>Fluid volume and how much to buy</li>
            <li>Expansion vessel size, steam included, and its pre-charge</li>
            <li>Cold fill pressure and the margin to the relief valve</li>
            <li>Freeze point of your glycol mix against the site&apos;s minimum</li>
            <li>Flow rate, velocity and pressure drop in each pipe run</li>
            <li>Collector output in full sun and stagnation temperature</li>
          </ul>
        </Card>
      </section>

      <section id="how-it-works" aria-labelledby="how-title" className="space-y-5">
        <h2 id="how-title" className="text-2xl font-bold">
          Who it is for
        </h2>
        <div className="grid gap-5 md:grid-cols-3">
          {ROLES.map((role) => (
            <Card key={role.who}>
              <role.icon aria-hidden className="h-8 w-8 text-copper-600" />
              <h3 className="mt-3 text-xl font-bold">{role.who}</h3>
              <p className="font-medium text-slate-700">{role.lead}</p>
              <ul className="mt-3 list-disc space-y-2 pl-5 text-slate-700">
                {role.points.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
              <ButtonLink href={role.cta.href} variant="secondary" className="mt-4">
                {role.cta.label}
              </ButtonLink>
            </Card>
          ))}
        </div>
      </section>

      <Cautions />
    </div>
  );
}
