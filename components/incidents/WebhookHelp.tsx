"use client";
// How to send alerts here: the webhook address and a receiver for Alertmanager's configuration
// (its documented webhook_config with http_config.authorization, whose type defaults to Bearer).
import { Card } from "@/components/ui/Card";

export function WebhookHelp({ env }: { env: string }) {
  const url = `${typeof window === "undefined" ? "" : window.location.origin}/api/v1/environments/${env}/alerts`;
  const amConfig = `receivers:
  - name: pinchpoint
    webhook_configs:
      - url: ${url}
        send_resolved: true
        http_config:
          authorization:
            credentials: ppt_…   # an API token with inventory:write, bound to ${env}`;
  const curl = `curl -X POST ${url} \\
  -H "Authorization: Bearer ppt_…" -H "Content-Type: application/json" \\
  -d '{"pinchpoint":"alerts/1","alerts":[{"component":"orders-db","severity":"critical","link":"https://…"}]}'`;
  return (
    <Card title="Sending alerts here">
      <div className="space-y-3 text-sm text-muted" data-testid="webhook-help">
        <p>
          Post to <span className="font-mono text-ink">{url}</span> with an API token that may write to this environment (admins create one under Admin → Tokens). Alertmanager&apos;s webhook body is read as it is;
          the alert labels named in the environment&apos;s settings (by default service, app, job) say which component an alert is about.
        </p>
        <pre className="overflow-x-auto rounded-md bg-raised p-3 font-mono text-xs text-ink">{amConfig}</pre>
        <p>Any other monitor or script can send the small Pinchpoint format: a component key or alias, a status (firing or resolved), a severity, a start time and a link.</p>
        <pre className="overflow-x-auto rounded-md bg-raised p-3 font-mono text-xs text-ink">{curl}</pre>
      </div>
    </Card>
  );
}
