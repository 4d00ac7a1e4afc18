// Host names written in configuration values: environment variables, command lines, connection
// strings. Importers match what this finds against the names of components in the same push
// (Compose service names, Kubernetes Service DNS names) to infer needs; a candidate that names
// nothing known is dropped by the caller, so this errs on the side of offering too many.
//
// Forms read (each case is in tests/importers/hosts.test.ts):
//   orders-db                         a bare name
//   orders-db:5432                    host:port
//   http://payment:8080/x             URL (RFC 3986 §3.2: [userinfo@]host[:port])
//   postgres://u:p@orders-db/x        URL with user info
//   mongodb://a:27017,b:27017/db      several hosts in one authority (MongoDB's connection string)
//   jdbc:postgresql://db:5432/x       a scheme wrapped in another
//   Server=sqldata;Database=x         `;`-separated key=value connection strings (also Host=, Data Source=, Address=)
//   tcp:sqldata,1433                  SQL Server's protocol prefix and comma before the port
//   --host=db, -hdb is not read       flags with `=` are; glued short flags are too ambiguous
// Why our own code: URL parsers reject most of these (no scheme, several hosts, `;` strings),
// and what is wanted is every plausible host, not one validated URL.

/** Labels of a DNS name (RFC 1123 §2.1): letters, digits and hyphens, not starting or ending with a hyphen; dots between labels. Underscores are accepted because Compose service names may carry them. */
const HOST = /^[a-z0-9_](?:[a-z0-9_-]{0,61}[a-z0-9_])?(?:\.[a-z0-9_](?:[a-z0-9_-]{0,61}[a-z0-9_])?)*$/;

// Keys of `key=value` connection-string parts whose value is a host.
const HOST_KEYS = new Set(["server", "host", "hostname", "data source", "datasource", "address", "addr", "host name", "network address"]);

function hostOf(token: string): string | null {
  let t = token.trim().replace(/^['"`]+|['"`]+$/g, "");
  if (t === "") return null;
  t = t.replace(/^tcp:/i, "");
  // host:port, with the port numeric (anything else after the colon is not a port).
  const colon = t.lastIndexOf(":");
  if (colon > 0 && /^\d{1,5}$/.test(t.slice(colon + 1))) t = t.slice(0, colon);
  const host = t.toLowerCase().replace(/\.$/, "");
  return HOST.test(host) && !/^\d+(\.\d+)*$/.test(host) ? host : null;
}

/** Hosts of the authority part after `scheme://`: user info dropped, several comma-separated hosts kept. */
function authorityHosts(rest: string): string[] {
  const end = rest.search(/[/?#\s]/);
  let authority = end === -1 ? rest : rest.slice(0, end);
  const at = authority.lastIndexOf("@");
  if (at !== -1) authority = authority.slice(at + 1);
  return authority.split(",").map(hostOf).filter((h): h is string => h !== null);
}

/** Every plausible host name in a configuration value, lower-cased, in order of appearance, without repeats. */
function hostsIn(value: string): string[] {
  const found: string[] = [];
  const add = (h: string | null) => {
    if (h !== null && !found.includes(h)) found.push(h);
  };
  // URLs first: they may contain `;`, `,` and `=` that the plainer forms below would split on.
  const urls = /[a-z][a-z0-9+.-]*:\/\/([^\s'"`]*)/gi;
  let rest = value;
  for (const m of value.matchAll(urls)) {
    for (const h of authorityHosts(m[1] ?? "")) add(h);
    rest = rest.replace(m[0], " ");
  }
  for (const part of rest.split(/[\s;]+/)) {
    if (part === "") continue;
    const eq = part.indexOf("=");
    if (eq !== -1) {
      const raw = part.slice(0, eq).trim().toLowerCase();
      const key = raw.replace(/^-+/, "");
      const val = part.slice(eq + 1);
      // A known host key, a variable named like one, or any command-line flag (`--upstream=orders:80`).
      if (HOST_KEYS.has(key) || /host|server|addr|url|endpoint|broker|uri/.test(key) || raw.startsWith("-")) {
        for (const piece of val.replace(/^tcp:/i, "").split(",")) add(hostOf(piece));
      }
      continue;
    }
    for (const piece of part.split(",")) add(hostOf(piece));
  }
  return found;
}

/**
 * The same for `;`-separated connection strings whose keys contain spaces ("Data Source=db"):
 * split on `;` only, so the key keeps its space.
 */
function hostsInConnectionString(value: string): string[] {
  const found: string[] = [];
  for (const part of value.split(";")) {
    const eq = part.indexOf("=");
    if (eq === -1) continue;
    const key = part.slice(0, eq).trim().toLowerCase();
    if (!HOST_KEYS.has(key)) continue;
    for (const piece of part.slice(eq + 1).replace(/^tcp:/i, "").split(",")) {
      const h = hostOf(piece);
      if (h !== null && !found.includes(h)) found.push(h);
    }
  }
  return found;
}

/** Both readings together: what an importer should match against known names. */
export function hostCandidates(value: string): string[] {
  const out = hostsIn(value);
  for (const h of hostsInConnectionString(value)) if (!out.includes(h)) out.push(h);
  return out;
}
