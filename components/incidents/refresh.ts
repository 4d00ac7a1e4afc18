/** How often incident screens ask again: Alertmanager sends a group's changes every group_interval (5 min by default) at most. */
export const INCIDENT_REFRESH_MS = 10_000;
