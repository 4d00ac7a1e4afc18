"use client";
// A page that failed on the server. The usual cause outside a bug is a database that went away
// between the proxy's check and the page's own queries (proxy.ts answers 503 from then on).
import { Button } from "@/components/ui/Button";
import { Card } from "@/components/ui/Card";

export default function PageError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <Card title="This page could not be shown">
      <p className="text-sm text-muted">
        Pinchpoint could not finish this page. If its database is unreachable, the page works again as soon as it answers;{" "}
        <a className="text-brass hover:underline" href="/api/health">/api/health</a> says whether it does.
      </p>
      <Button type="button" className="mt-4" onClick={() => reset()}>
        Try again
      </Button>
    </Card>
  );
}
