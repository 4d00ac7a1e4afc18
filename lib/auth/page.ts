// For server components (pages and layouts): the signed-in user, or a redirect.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import { actorCan, resolveActor, type Actor } from "./actor";
import { databaseUnavailable, isDatabaseUnavailable } from "@/lib/errors";
import type { Permission } from "./roles";

export type UserActor = Extract<Actor, { type: "user" }>;

/** Once per request, however many layouts and pages ask (React's request cache). */
export const requireUser = cache(async function requireUser(): Promise<UserActor> {
  // An unreachable database is not a signed-out user: say so (error page) instead of asking to sign in.
  const actor = await resolveActor(await headers()).catch((error: unknown) => {
    if (isDatabaseUnavailable(error)) throw databaseUnavailable();
    return null;
  });
  if (!actor || actor.type !== "user") redirect("/signin");
  return actor;
});

export async function requirePagePermission(permission: Permission): Promise<UserActor> {
  const user = await requireUser();
  if (!actorCan(user, permission)) redirect("/forbidden");
  return user;
}
