// Types of scripts/private-server.mjs for the TypeScript that imports it (tests' global setup, benchmarks).
export declare function startPrivateServers(options?: { quiet?: boolean }): void
