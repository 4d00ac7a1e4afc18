// SQL pieces every paged list shares (lib/api/schemas/common.ts describes the lists).
import type { SortOrder } from "@/lib/api/schemas/common";

/** A LIKE pattern that finds `text` anywhere, LIKE's own characters taken literally. */
export const containsPattern = (text: string): string => `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/** ORDER BY one column, nulls last either way, then a unique tie-break so that pages never overlap or skip a row. */
export const orderSql = (column: string, order: SortOrder, tieBreak: string): string => `${column} ${order === "asc" ? "ASC" : "DESC"} NULLS LAST, ${tieBreak}`;
