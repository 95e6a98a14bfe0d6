// Studies: noise margin and tolerance spread (pure TypeScript; no React, Next or database).
export * from "@/lib/schemas/study";
export * from "./random";
export * from "./stats";
export * from "./noise-margin";
export * from "./tolerance-spread";
export * from "./capture-noise";
export * from "./study";
export * from "./grid";
export * from "./saved";
export * from "./corners";
