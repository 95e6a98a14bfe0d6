// Moved to lib/workbench/stage-kinds.ts (pure logic, no React); kept for existing importers.
export * from "@/lib/workbench/stage-kinds";
