// Stands in for the `server-only` guard when server code runs outside Next (see tsconfig.worker.json).
export {};
