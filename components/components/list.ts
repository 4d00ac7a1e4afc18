// The components list's view, shared by the page (which renders its first answer with the HTML)
// and the screen (components/components/ComponentList.tsx), so both ask for the same URL.
import { listQueryOf } from "@/components/ui/data-table/list-query";
import { COMPONENT_LIST } from "@/lib/api/schemas/components";

export const COMPONENT_FILTERS = ["q", "team", "kind", "tier", "unowned"] as const;
export const COMPONENT_PAGE_SIZE = 50;

export const componentsQueryOf = (get: (name: string) => string | null) => listQueryOf(COMPONENT_LIST, get, { filters: COMPONENT_FILTERS, pageSize: COMPONENT_PAGE_SIZE });

export const componentsUrl = (env: string, query: URLSearchParams) => `/api/v1/environments/${env}/components?${query}`;
