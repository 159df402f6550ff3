// Types of scripts/build-worker.mjs for the TypeScript that imports it (tests' global setup, benchmarks).
export declare const WORKER_BUNDLE: string
export declare function buildWorker(): Promise<void>
