// Stands in for the `server-only` guard package under Vitest (see vitest.config.ts).
export {};
