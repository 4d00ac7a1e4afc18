// For server components (pages and layouts): the signed-in user, or a redirect.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { actorCan, resolveActor, type Actor } from "./actor";
import type { Permission } from "./roles";

export type UserActor = Extract<Actor, { type: "user" }>;

export async function requireUser(): Promise<UserActor> {
  const actor = await resolveActor(await headers()).catch(() => null);
  if (!actor || actor.type !== "user") redirect("/signin");
  return actor;
}

export async function requirePagePermission(permission: Permission): Promise<UserActor> {
  const user = await requireUser();
  if (!actorCan(user, permission)) redirect("/forbidden");
  return user;
}
