// Reviews whose look-again date has passed, in every environment. Rendered on the server.
import Link from "next/link";
import { Card } from "@/components/ui/Card";
import type { ReviewView } from "@/lib/api/schemas/reviews";
import { ReviewBadge } from "./ReviewBadge";

export function OverduePanel({ items }: { items: ReviewView[] }) {
  return (
    <Card title={`Reviews past their date (${items.length})`}>
      {items.length === 0 ? (
        <p className="text-sm text-muted">No accepted or mitigating risk is past its review-by date.</p>
      ) : (
        <ul className="divide-y divide-line" data-testid="overdue-reviews">
          {items.map((r) => (
            <li key={`${r.environment}/${r.key}`} className="flex flex-wrap items-center gap-2 py-2">
              <Link href={`/environments/${r.environment}/reviews`} className="font-mono text-sm text-ink hover:text-brass">
                {r.key}
              </Link>
              <span className="font-mono text-xs text-faint">{r.environment}</span>
              <ReviewBadge review={r} />
              <span className="ml-auto text-xs text-muted">{r.reviewer ? `by ${r.reviewer.email}` : "reviewer gone"}</span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
