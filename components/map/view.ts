// The view model lives in lib/map so the worker lays out the same views the browser draws.
export * from "@/lib/map/view";
