import { Card } from "@/components/ui/card";

export function AuthCard({
  title,
  children,
  footer,
}: {
  title: string;
  children: React.ReactNode;
  footer?: React.ReactNode;
}) {
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-3xl font-bold">{title}</h1>
      <Card>{children}</Card>
      {footer ? <div className="text-slate-700">{footer}</div> : null}
    </div>
  );
}
