// The inventory file format (format 1), rendered from the JSON Schema the server validates with.
import { Card } from "@/components/ui/Card";
import { inventoryJsonSchema } from "@/lib/inventory/schema";
import { schemaSections } from "@/lib/inventory/schema-doc";

export const metadata = { title: "File format" };

export default function FormatPage() {
  const sections = schemaSections(inventoryJsonSchema());
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Inventory file format 1</h1>
        <p className="mt-1 max-w-3xl text-sm text-muted">
          What a Pinchpoint inventory file may hold, field by field. YAML or JSON; one file per source (usually a repository). This page is generated from the
          same JSON Schema the server checks pushes with, so it cannot disagree with it.
        </p>
        <p className="mt-2 flex flex-wrap gap-4 text-sm">
          <a href="/samples/pinchpoint-sample.yaml" download className="text-brass underline underline-offset-4">
            Download a sample file
          </a>
          <a href="/api/v1/schema/inventory" className="text-brass underline underline-offset-4">
            The JSON Schema itself
          </a>
        </p>
      </div>
      {sections.map((s) => (
        <Card key={s.path} title={<span className="font-mono">{s.path}</span>}>
          {s.description && <p className="mb-3 text-sm text-muted">{s.description}</p>}
          <div className="overflow-x-auto">
            <table className="w-full text-sm">
              <caption className="sr-only">Fields of {s.path}</caption>
              <thead>
                <tr className="border-b border-line text-left text-xs text-muted">
                  <th scope="col" className="py-1.5 pr-3 font-medium">Field</th>
                  <th scope="col" className="py-1.5 pr-3 font-medium">Type</th>
                  <th scope="col" className="py-1.5 pr-3 font-medium">Required</th>
                  <th scope="col" className="py-1.5 pr-3 font-medium">Meaning</th>
                  <th scope="col" className="py-1.5 font-medium">Limits</th>
                </tr>
              </thead>
              <tbody>
                {s.fields.map((f) => (
                  <tr key={f.name} className="border-b border-line/60 align-top">
                    <th scope="row" className="py-1.5 pr-3 text-left font-mono font-normal text-ink">{f.name}</th>
                    <td className="py-1.5 pr-3 text-muted">{f.type}</td>
                    <td className="py-1.5 pr-3">{f.required ? "yes" : <span className="text-muted">no</span>}</td>
                    <td className="py-1.5 pr-3">{f.description ?? <span className="text-muted">—</span>}</td>
                    <td className="py-1.5 font-mono text-xs text-muted">{f.limits.join("; ") || "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Card>
      ))}
      <p className="text-xs text-muted">Rankings and drills are only as good as the files pushed: a need nobody declares is not counted.</p>
    </div>
  );
}
