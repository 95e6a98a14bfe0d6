// Moved to lib/workbench/readings-logic.ts (pure logic, no React); kept for existing importers.
export * from "@/lib/workbench/readings-logic";
