// Transactions for code outside the data layer that must join one (a notice queued with the change
// it announces): an opaque handle, and a way to run work in a savepoint of it.
import "server-only";
import type { Transaction } from "sequelize";
import { db } from "@/models";

export type DataTransaction = Transaction;

/**
 * `work` in a savepoint of `parent` (Sequelize nests transactions that way), or in a transaction of
 * its own: either way all or nothing, and with a parent, undone with it.
 */
export function withTransaction<T>(parent: DataTransaction | undefined, work: (transaction: DataTransaction) => Promise<T>): Promise<T> {
  return db().sequelize.transaction(parent ? { transaction: parent } : {}, work);
}
