// Limits on what one push may contain. Enforced by the importers (413 when exceeded);
// exported so the push API, the docs page and the tests quote the same numbers.

/** Largest request body accepted, in bytes (20 MiB). */
export const MAX_BODY_BYTES = 20 * 1024 * 1024;

/** Most components one file may declare. The product promises at least 50,000. */
export const MAX_COMPONENTS = 50_000;

/**
 * Passed to the `yaml` package as `maxAliasCount`: it refuses an anchor whose uses times
 * the aliases nested inside it exceed this number.
 */
export const MAX_YAML_ALIAS_COUNT = 10_000;

/**
 * Our own cap on nodes reached through aliases (an alias counts as every node under its
 * anchor). `yaml` hands aliased objects out by reference, so memory stays small, but
 * validation walks each reference: a few large anchors aliased many times would take
 * minutes without this. Real inventories use `defaults` and need far fewer.
 */
export const MAX_YAML_ALIAS_EXPANSION = 200_000;

/** At most this many issues are returned; one more issue says how many were left out. */
export const MAX_ISSUES = 1_000;

/** Longest display name, free label (`via`, zone, tag, link name) and link URL. */
export const MAX_NAME_LENGTH = 200;
export const MAX_LABEL_LENGTH = 64;
export const MAX_URL_LENGTH = 2_048;

/**
 * Deepest nesting of flow collections (`[`/`{`) or compact block sequences (`- - -`) accepted.
 * A format 1 file needs 6 levels; the YAML parser takes seconds on a few million, so the
 * text is checked before it is parsed.
 */
export const MAX_NESTING_DEPTH = 64;

/**
 * Largest trace file streamed through `?format=otlp` (JSON Lines). Traces are folded as they are
 * read and never held whole, so this can be far above MAX_BODY_BYTES; one line (one OTLP request)
 * and a single-document file are still held whole and keep MAX_BODY_BYTES, the OTLP specification's
 * recommended request limit (20 MiB).
 */
export const MAX_TRACE_FILE_BYTES = 2 * 1024 * 1024 * 1024;
