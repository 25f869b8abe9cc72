/** Part profiles: NACA 4-digit sections, tapered panels and polygon extrusions. Pure TypeScript. */
export * from "./naca";
export * from "./polygon";
export * from "./part";
